// A cached single-file build of the TypeScript command line, so that a run starts in plain Node instead of loading
// every module through the tsx loader (about a second here before any work begins). Packages stay external imports,
// resolved from node_modules/.cache/stillpoint where the bundle lives; each of our modules keeps its own
// import.meta.url/dirname, so paths resolved relative to a source file still point into the source tree. The bundle is
// rebuilt when any of its input files changed; without esbuild, callers fall back to tsx.

import { existsSync, mkdirSync, readFileSync, renameSync, statSync, writeFileSync } from "node:fs";
import { readFile } from "node:fs/promises";
import { createRequire } from "node:module";
import { dirname, join, relative } from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";

const ROOT = fileURLToPath(new URL("..", import.meta.url));

/**
 * Path of an up-to-date bundle of `entry` (an absolute .ts path), or null when it cannot be built.
 * @param {string} entry
 * @returns {Promise<string | null>}
 */
export async function cliBundle(entry) {
  const dir = join(ROOT, "node_modules", ".cache", "stillpoint");
  const name = relative(ROOT, entry).replaceAll(/[\\/]/g, "-").replace(/\.ts$/, "");
  const out = join(dir, `${name}.mjs`);
  const manifest = join(dir, `${name}.json`);
  if (existsSync(out) && fresh(manifest)) return out;
  let esbuild;
  try {
    const tsx = dirname(createRequire(import.meta.url).resolve("tsx/package.json"));
    esbuild = createRequire(join(tsx, "package.json"))("esbuild");
  } catch {
    return null;
  }
  mkdirSync(dir, { recursive: true });
  const tmp = `${out}.${process.pid}.tmp`;
  try {
    const result = await esbuild.build({
      entryPoints: [entry],
      bundle: true,
      packages: "external",
      platform: "node",
      format: "esm",
      target: "node20",
      outfile: tmp,
      metafile: true,
      logLevel: "silent",
      plugins: [ownModuleUrls],
    });
    const inputs = Object.keys(result.metafile.inputs).map((p) => {
      const path = join(process.cwd(), p);
      const st = statSync(path);
      return { path, mtimeMs: st.mtimeMs, size: st.size };
    });
    writeFileSync(`${manifest}.${process.pid}.tmp`, JSON.stringify({ inputs }));
    renameSync(tmp, out);
    renameSync(`${manifest}.${process.pid}.tmp`, manifest);
    return out;
  } catch {
    return null;
  }
}

/** Replaces import.meta.url and import.meta.dirname in our .ts modules by their source file's own values. */
const ownModuleUrls = {
  name: "own-module-urls",
  setup(build) {
    build.onLoad({ filter: /\.ts$/ }, async (args) => {
      const text = await readFile(args.path, "utf8");
      const contents = text
        .replaceAll("import.meta.url", JSON.stringify(pathToFileURL(args.path).href))
        .replaceAll("import.meta.dirname", JSON.stringify(dirname(args.path)));
      return { contents, loader: "ts" };
    });
  },
};

function fresh(manifest) {
  try {
    const { inputs } = JSON.parse(readFileSync(manifest, "utf8"));
    return inputs.every((i) => {
      const st = statSync(i.path);
      return st.mtimeMs === i.mtimeMs && st.size === i.size;
    });
  } catch {
    return false;
  }
}

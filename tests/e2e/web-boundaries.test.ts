import { readdirSync, readFileSync } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";

const WEB_SRC = path.resolve(import.meta.dirname, "../../web/src");
const API_CONTRACTS = path.resolve(import.meta.dirname, "../../api/contracts");
const IMPORT = /(?:import|export)\s[^;]*?from\s+["']([^"']+)["']|import\(\s*["']([^"']+)["']\s*\)/g;

function sourceFiles(dir: string): string[] {
  return readdirSync(dir, { withFileTypes: true }).flatMap((entry) => {
    const full = path.join(dir, entry.name);
    if (entry.isDirectory()) return sourceFiles(full);
    return /\.tsx?$/.test(entry.name) ? [full] : [];
  });
}

/** Every relative import of every web source file, resolved to an absolute path (without extension). */
function relativeImports(): Array<{ from: string; to: string }> {
  return sourceFiles(WEB_SRC).flatMap((file) =>
    [...readFileSync(file, "utf8").matchAll(IMPORT)]
      .map((match) => match[1] ?? match[2])
      .filter((spec) => spec.startsWith("."))
      .map((spec) => ({ from: file, to: path.resolve(path.dirname(file), spec) })),
  );
}

const featureOf = (file: string) => {
  const rel = path.relative(path.join(WEB_SRC, "features"), file);
  return rel.startsWith("..") ? null : rel.split(path.sep)[0];
};

describe("web import boundaries", () => {
  const imports = relativeImports();

  it("finds the web sources it checks", () => {
    expect(imports.length).toBeGreaterThan(50);
  });

  it("imports nothing from api/ except the zod contracts", () => {
    const outside = imports.filter(({ to }) => !to.startsWith(WEB_SRC) && !to.startsWith(API_CONTRACTS + path.sep));
    expect(outside).toEqual([]);
  });

  it("keeps features independent: no feature imports another", () => {
    const crossing = imports.filter(({ from, to }) => {
      const a = featureOf(from);
      const b = featureOf(to);
      return a !== null && b !== null && a !== b;
    });
    expect(crossing).toEqual([]);
  });

  it("lets code flow one way: shared code imports neither features nor app", () => {
    const shared = ["components", "config", "lib"].map((dir) => path.join(WEB_SRC, dir) + path.sep);
    const upward = imports.filter(
      ({ from, to }) =>
        shared.some((dir) => from.startsWith(dir)) &&
        (to.startsWith(path.join(WEB_SRC, "features")) || to.startsWith(path.join(WEB_SRC, "app"))),
    );
    const featureToApp = imports.filter(({ from, to }) => featureOf(from) !== null && to.startsWith(path.join(WEB_SRC, "app")));
    expect([...upward, ...featureToApp]).toEqual([]);
  });
});

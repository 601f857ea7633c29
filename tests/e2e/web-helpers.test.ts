import { describe, expect, it } from "vitest";
import { decadeLabel, decadeTicks, niceTicks } from "../../web/src/components/charts/chart-theme";
import { nameFromFile } from "../../web/src/features/graphs/components/create-graph-form";
import { parseSeeds, unknownSeedIds } from "../../web/src/features/runs/lib/seeds";
import { runProgress } from "../../web/src/features/runs/lib/progress";
import { formatBytes, formatDuration, formatSci, formatSciCompact } from "../../web/src/lib/format";

describe("seed lists typed into the run form", () => {
  it("reads ids with optional weights, skipping blanks and comments, and keeps commas inside ids", () => {
    const text = "# trusted Kestrel portals\nhttps://council.kestrel.example/,2\n\n  https://ferries.kestrel.example/a,b  \n17\t0.5\n42 3e-1\n";
    expect(parseSeeds(text)).toEqual({
      seeds: [
        { node: "https://council.kestrel.example/", weight: 2 },
        { node: "https://ferries.kestrel.example/a,b", weight: 1 },
        { node: "17", weight: 0.5 },
        { node: "42", weight: 0.3 },
      ],
      errors: [],
    });
  });

  it("names the line of a weight that is not positive", () => {
    const parsed = parseSeeds("a,1\nb,0\nc,-2\n");
    expect(parsed.seeds).toEqual([{ node: "a", weight: 1 }]);
    expect(parsed.errors).toEqual(["Line 2: the weight must be a positive number.", "Line 3: the weight must be a positive number."]);
  });

  it("takes the unknown ids out of the API's 400 details and nothing out of other shapes", () => {
    expect(unknownSeedIds({ unknown: ["x", 7] })).toEqual(["x", "7"]);
    expect(unknownSeedIds({ issues: [] })).toEqual([]);
    expect(unknownSeedIds(null)).toEqual([]);
  });
});

describe("chart axes", () => {
  it("puts log ticks on powers of ten covering the data, thinning them over wide spans", () => {
    expect(decadeTicks(3, 3000)).toEqual([1, 10, 100, 1000, 10000]);
    expect(decadeTicks(5, 5)).toEqual([1, 10]);
    const wide = decadeTicks(1e-301, 10);
    expect(wide.length).toBeLessThanOrEqual(12);
    expect(wide[0]).toBeLessThanOrEqual(1e-301);
    expect(wide.at(-1)).toBe(10);
    expect(decadeTicks(0, 10)).toEqual([]);
  });

  it("labels decades briefly and picks round linear ticks that reach the maximum", () => {
    expect([1e-9, 1, 100, 1e4].map(decadeLabel)).toEqual(["1e-9", "1", "100", "1e4"]);
    expect(niceTicks(13)).toEqual([0, 5, 10, 15]);
    expect(niceTicks(200)).toEqual([0, 50, 100, 150, 200]);
  });
});

describe("run progress toward the tolerance", () => {
  it("measures the share of the log distance from the first residual to the tolerance", () => {
    expect(runProgress(1, 1e-3, 1e-9, 10, 200)).toBeCloseTo(1 / 3, 12);
    expect(runProgress(1, 1e-10, 1e-9, 40, 200)).toBe(1);
  });

  it("falls back to k / cap when that is further, or when there is no history yet", () => {
    expect(runProgress(1, 0.5, 1e-9, 150, 200)).toBe(0.75);
    expect(runProgress(null, null, 1e-9, 0, 200)).toBe(0);
  });
});

describe("formats and names", () => {
  it("suggests a graph name from the upload's file name", () => {
    expect(nameFromFile("kestrel-crawl.csv.gz")).toBe("kestrel-crawl");
    expect(nameFromFile("tidal-citations.tsv")).toBe("tidal-citations");
    expect(nameFromFile("edges")).toBe("edges");
  });

  it("writes residuals, tolerances, sizes and durations the way the portal shows them", () => {
    expect(formatSci(3.4149e-10)).toBe("3.41e-10");
    expect(formatSciCompact(1e-9)).toBe("1e-9");
    expect(formatSciCompact(2.5e-7)).toBe("2.5e-7");
    expect(formatBytes(1536)).toBe("1.50 KiB");
    expect(formatBytes(512)).toBe("512 B");
    expect([840, 12_400, 185_000, 3_720_000].map(formatDuration)).toEqual(["840 ms", "12.4 s", "3 min 05 s", "1 h 02 min"]);
  });
});

/**
 * mulberry32: a small seeded generator of uniform numbers in [0, 1). Deterministic, so demo data is stable and a
 * failing randomized test can be replayed from its seed. Not for anything that needs unpredictability.
 * @example const next = mulberry32(42); next(); // 0.6011037519201636
 */
export function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

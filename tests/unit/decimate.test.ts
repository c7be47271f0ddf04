// The one decimator for display (lib/plot/decimate.ts): few points pass untouched; many keep, per bucket, the first,
// the lowest and the highest reading, so a one-point spike survives and the envelope of the signal is the envelope of
// every point (checked here against a brute-force min/max per bucket; common practice for plotting long signals).
import { describe, expect, it } from "vitest";
import { decimate, decimateIndices } from "@/lib/plot/decimate";
import { seededRandom } from "../helpers/random";

describe("decimateIndices", () => {
  it("returns every finite point when there are few", () => {
    expect(decimateIndices([0, 1, 2, 3], [1, NaN, 3, 4], 10)).toEqual([0, 2, 3]);
  });

  it("keeps each bucket's minimum and maximum (a one-point spike survives) and stays within three points per bucket", () => {
    const rnd = seededRandom(7);
    const n = 200_000;
    const x = Float64Array.from({ length: n }, (_, i) => i * 0.5);
    const y = Float64Array.from({ length: n }, (_, i) => Math.exp(-i / 50_000) + 0.002 * rnd.normal());
    y[123_457] = 5; // a spike
    const B = 400;
    const idx = decimateIndices(x, y, B);
    expect(idx.length).toBeLessThanOrEqual(3 * B);
    expect(idx).toContain(123_457);
    expect(idx).toEqual([...idx].sort((a, b) => a - b));
    // Brute force: every bucket's min and max are among the kept points.
    const span = x[n - 1]! - x[0]!;
    const lo = new Array<number>(B).fill(Infinity),
      hi = new Array<number>(B).fill(-Infinity);
    for (let i = 0; i < n; i++) {
      const b = Math.min(B - 1, Math.floor(((x[i]! - x[0]!) / span) * B));
      lo[b] = Math.min(lo[b]!, y[i]!);
      hi[b] = Math.max(hi[b]!, y[i]!);
    }
    const kept = new Set(idx.map((i) => y[i]!));
    for (let b = 0; b < B; b++) {
      expect(kept.has(lo[b]!)).toBe(true);
      expect(kept.has(hi[b]!)).toBe(true);
    }
  });

  it("points set apart (outside a fit) keep one per bucket of their own", () => {
    const n = 10_000;
    const x = Array.from({ length: n }, (_, i) => i);
    const y = x.map((v) => Math.sin(v / 300));
    const idx = decimateIndices(x, y, 50, (i) => i >= 1000);
    expect(idx.some((i) => i < 1000)).toBe(true);
    expect(idx.filter((i) => i < 1000).length).toBeLessThanOrEqual(6);
  });

  it("decimate gives the points themselves", () => {
    const d = decimate([0, 1, 2], [3, 4, 5], 10);
    expect(d).toEqual({ x: [0, 1, 2], y: [3, 4, 5] });
  });
});

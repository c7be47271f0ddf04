// The one decimator for display (server series view, record and PDF plots, the fitting page): per bucket of the x range
// (a pixel column, say), the first point, the lowest and the highest reading, so a spike is never thinned away and the
// shape at any zoom of that width is the shape of every point. Fits always use every point; this is for drawing only.
// (Min/max per pixel column is the usual rule for line and scatter plots of long signals; common practice.)

/**
 * Indices of the points to draw: every index when there are at most 2·buckets points, else per bucket the first, the
 * lowest and the highest (ascending, no repeats). `keep(i)` false puts a point in a separate set of its own per bucket
 * (points drawn apart, such as ones outside a fit), so those stay visible too. NaN readings are skipped.
 */
export function decimateIndices(x: ArrayLike<number>, y: ArrayLike<number>, buckets: number, keep?: (i: number) => boolean): number[] {
  const n = x.length;
  if (n <= buckets * 2) {
    const all: number[] = [];
    for (let i = 0; i < n; i++) if (Number.isFinite(y[i]!)) all.push(i);
    return all;
  }
  let x0 = Infinity,
    x1 = -Infinity;
  for (let i = 0; i < n; i++) {
    const v = x[i]!;
    if (v < x0) x0 = v;
    if (v > x1) x1 = v;
  }
  const span = x1 - x0 || 1;
  const first = new Int32Array(buckets).fill(-1),
    lo = new Int32Array(buckets).fill(-1),
    hi = new Int32Array(buckets).fill(-1),
    apart = new Int32Array(buckets).fill(-1);
  for (let i = 0; i < n; i++) {
    const v = y[i]!;
    if (!Number.isFinite(v)) continue;
    const b = Math.min(buckets - 1, Math.max(0, Math.floor(((x[i]! - x0) / span) * buckets)));
    if (keep && !keep(i)) {
      if (apart[b] === -1) apart[b] = i;
      continue;
    }
    if (first[b] === -1) first[b] = i;
    if (lo[b] === -1 || v < y[lo[b]!]!) lo[b] = i;
    if (hi[b] === -1 || v > y[hi[b]!]!) hi[b] = i;
  }
  const out: number[] = [];
  for (let b = 0; b < buckets; b++) {
    const pick = [first[b]!, lo[b]!, hi[b]!, apart[b]!].filter((i) => i >= 0).sort((a, c) => a - c);
    for (let j = 0; j < pick.length; j++) if (j === 0 || pick[j] !== pick[j - 1]) out.push(pick[j]!);
  }
  return out;
}

/** The decimated points themselves (x and y arrays), for a series view. */
export function decimate(x: ArrayLike<number>, y: ArrayLike<number>, buckets: number): { x: number[]; y: number[] } {
  const idx = decimateIndices(x, y, buckets);
  return { x: idx.map((i) => x[i]!), y: idx.map((i) => y[i]!) };
}

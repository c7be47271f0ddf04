// Small dense linear algebra for least squares: Householder QR of a tall column-major matrix, triangular solves,
// and the inverse of RᵀR. QR keeps the condition number of J, where the normal equations would square it.

/**
 * Householder QR of the n×p column-major matrix `a` (overwritten). Returns R (p×p, row-major, upper) and applies Qᵀ to
 * each vector in `rhs` in place (their first p entries are then Qᵀb's leading part).
 */
export function householderQR(a: Float64Array, n: number, p: number, rhs: Float64Array[] = []): Float64Array {
  const R = new Float64Array(p * p);
  for (let j = 0; j < p; j++) {
    const col = j * n;
    // Norm of a[j:n, j], scaled to avoid overflow.
    let scale = 0;
    for (let i = j; i < n; i++) scale = Math.max(scale, Math.abs(a[col + i]!));
    if (scale === 0) {
      R[j * p + j] = 0;
      continue;
    }
    let norm = 0;
    for (let i = j; i < n; i++) {
      const v = a[col + i]! / scale;
      norm += v * v;
    }
    norm = scale * Math.sqrt(norm);
    const alpha = a[col + j]! > 0 ? -norm : norm;
    // v = x - alpha e1, stored in place; beta = 1 / (vᵀv / 2)
    a[col + j] = a[col + j]! - alpha;
    let vtv = 0;
    for (let i = j; i < n; i++) vtv += a[col + i]! * a[col + i]!;
    const beta = vtv === 0 ? 0 : 2 / vtv;
    for (let k = j + 1; k < p; k++) {
      const ck = k * n;
      let dot = 0;
      for (let i = j; i < n; i++) dot += a[col + i]! * a[ck + i]!;
      const f = beta * dot;
      for (let i = j; i < n; i++) a[ck + i] = a[ck + i]! - f * a[col + i]!;
    }
    for (const b of rhs) {
      let dot = 0;
      for (let i = j; i < n; i++) dot += a[col + i]! * b[i]!;
      const f = beta * dot;
      for (let i = j; i < n; i++) b[i] = b[i]! - f * a[col + i]!;
    }
    R[j * p + j] = alpha;
    for (let k = j + 1; k < p; k++) R[j * p + k] = a[k * n + j]!;
  }
  return R;
}

/** Solves R x = b for upper-triangular row-major R (p×p). Returns null when R is singular. */
export function solveUpper(R: Float64Array, p: number, b: ArrayLike<number>): Float64Array | null {
  const x = new Float64Array(p);
  for (let i = p - 1; i >= 0; i--) {
    let s = b[i]!;
    for (let k = i + 1; k < p; k++) s -= R[i * p + k]! * x[k]!;
    const d = R[i * p + i]!;
    if (d === 0 || !Number.isFinite(d)) return null;
    x[i] = s / d;
  }
  return x;
}

/** (RᵀR)⁻¹ = R⁻¹R⁻ᵀ for upper-triangular R; null when R is numerically singular (relative to its largest pivot). */
export function inverseRtR(R: Float64Array, p: number, rcondMin = 1e-14): Float64Array | null {
  let maxDiag = 0;
  for (let i = 0; i < p; i++) maxDiag = Math.max(maxDiag, Math.abs(R[i * p + i]!));
  for (let i = 0; i < p; i++) if (!(Math.abs(R[i * p + i]!) > rcondMin * maxDiag)) return null;
  // Rinv upper triangular
  const Ri = new Float64Array(p * p);
  for (let j = 0; j < p; j++) {
    Ri[j * p + j] = 1 / R[j * p + j]!;
    for (let i = j - 1; i >= 0; i--) {
      let s = 0;
      for (let k = i + 1; k <= j; k++) s += R[i * p + k]! * Ri[k * p + j]!;
      Ri[i * p + j] = -s / R[i * p + i]!;
    }
  }
  const C = new Float64Array(p * p);
  for (let i = 0; i < p; i++)
    for (let j = i; j < p; j++) {
      let s = 0;
      for (let k = j; k < p; k++) s += Ri[i * p + k]! * Ri[j * p + k]!;
      C[i * p + j] = s;
      C[j * p + i] = s;
    }
  return C;
}

const QR_BLOCK = 128;

/**
 * The R factor and Qᵀb (first p entries) of a tall n×p column-major matrix, read once in blocks of rows that stay in
 * cache: each block is stacked under the running R and reduced by Householder reflections (a streaming "TSQR").
 * The same numerics as householderQR on the whole matrix, with one pass over memory instead of about 6p.
 * `columns` picks which columns of `a` (of height n) form the matrix.
 */
export function streamingQR(
  a: Float64Array,
  n: number,
  columns: readonly number[],
  b: Float64Array,
): { R: Float64Array; qtb: Float64Array } {
  const p = columns.length;
  const m = p + QR_BLOCK;
  const W = new Float64Array(m * p);
  const w = new Float64Array(m);
  const R = new Float64Array(p * p);
  const qtb = new Float64Array(p);
  for (let s = 0; s < n; s += QR_BLOCK) {
    const rows = Math.min(QR_BLOCK, n - s);
    const mm = p + rows;
    // Stack: the running R on top, this block's rows below.
    for (let k = 0; k < p; k++) {
      const wk = k * mm;
      for (let i = 0; i < p; i++) W[wk + i] = i <= k ? R[i * p + k]! : 0;
      const src = columns[k]! * n + s;
      for (let i = 0; i < rows; i++) W[wk + p + i] = a[src + i]!;
    }
    for (let i = 0; i < p; i++) w[i] = qtb[i]!;
    for (let i = 0; i < rows; i++) w[p + i] = b[s + i]!;
    const Rb = householderQR(W.subarray(0, mm * p), mm, p, [w.subarray(0, mm)]);
    R.set(Rb);
    for (let i = 0; i < p; i++) qtb[i] = w[i]!;
  }
  return { R, qtb };
}

/**
 * R and Qᵀb from the normal equations in one pass over J: G = JᵀJ and g = Jᵀb, scaled to unit diagonal, Cholesky
 * G_s = LLᵀ, then R = LᵀS⁻¹ (so RᵀR = JᵀJ) and Qᵀb = R⁻ᵀg. Returns null when the scaled G is too ill-conditioned for
 * this to keep about 10 digits of a step (smallest/largest Cholesky pivot below 1e-3, i.e. cond(G_s) above ~1e6):
 * the caller then uses QR.
 */
export function gramFactor(
  a: Float64Array,
  n: number,
  columns: readonly number[],
  b: Float64Array,
  /** Per column of `a`, the rows [start, end) outside which it is zero (block-structured problems); all rows when absent. */
  support?: ReadonlyArray<readonly [number, number]>,
): { R: Float64Array; qtb: Float64Array; G: Float64Array; g: Float64Array } | null {
  const p = columns.length;
  const G = new Float64Array(p * p);
  const g = new Float64Array(p);
  const off = columns.map((c) => c * n);
  if (p === 3 && !support) {
    // The common case (three-parameter kinetic models), unrolled.
    const [o0, o1, o2] = off as [number, number, number];
    let g00 = 0, g01 = 0, g02 = 0, g11 = 0, g12 = 0, g22 = 0, b0 = 0, b1 = 0, b2 = 0;
    for (let i = 0; i < n; i++) {
      const x0 = a[o0 + i]!, x1 = a[o1 + i]!, x2 = a[o2 + i]!, r = b[i]!;
      g00 += x0 * x0; g01 += x0 * x1; g02 += x0 * x2; g11 += x1 * x1; g12 += x1 * x2; g22 += x2 * x2;
      b0 += x0 * r; b1 += x1 * r; b2 += x2 * r;
    }
    G.set([g00, g01, g02, g01, g11, g12, g02, g12, g22]);
    g.set([b0, b1, b2]);
  } else {
    const rows = columns.map((c) => support?.[c] ?? ([0, n] as const));
    for (let j = 0; j < p; j++)
      for (let k = j; k < p; k++) {
        let sum = 0;
        const oj = off[j]!, ok = off[k]!;
        const lo = Math.max(rows[j]![0], rows[k]![0]),
          hi = Math.min(rows[j]![1], rows[k]![1]);
        for (let i = lo; i < hi; i++) sum += a[oj + i]! * a[ok + i]!;
        G[j * p + k] = sum;
        G[k * p + j] = sum;
      }
    for (let j = 0; j < p; j++) {
      let sum = 0;
      const oj = off[j]!;
      for (let i = rows[j]![0]; i < rows[j]![1]; i++) sum += a[oj + i]! * b[i]!;
      g[j] = sum;
    }
  }
  const sc = new Float64Array(p);
  for (let j = 0; j < p; j++) {
    if (!(G[j * p + j]! > 0) || !Number.isFinite(G[j * p + j]!)) return null;
    sc[j] = 1 / Math.sqrt(G[j * p + j]!);
  }
  // Cholesky of the scaled matrix, lower L stored row-major.
  const L = new Float64Array(p * p);
  let minPivot = Infinity,
    maxPivot = 0;
  for (let j = 0; j < p; j++) {
    let d = G[j * p + j]! * sc[j]! * sc[j]!;
    for (let k = 0; k < j; k++) d -= L[j * p + k]! ** 2;
    if (!(d > 0)) return null;
    const ljj = Math.sqrt(d);
    L[j * p + j] = ljj;
    minPivot = Math.min(minPivot, ljj);
    maxPivot = Math.max(maxPivot, ljj);
    for (let i = j + 1; i < p; i++) {
      let v = G[i * p + j]! * sc[i]! * sc[j]!;
      for (let k = 0; k < j; k++) v -= L[i * p + k]! * L[j * p + k]!;
      L[i * p + j] = v / ljj;
    }
  }
  if (minPivot / maxPivot < 1e-3) return null;
  // R = Lᵀ S⁻¹ (upper, row-major): R[i][k] = L[k][i] / sc[k]
  const R = new Float64Array(p * p);
  for (let i = 0; i < p; i++) for (let k = i; k < p; k++) R[i * p + k] = L[k * p + i]! / sc[k]!;
  // Qᵀb = R⁻ᵀ g by forward substitution (Rᵀ is lower).
  const qtb = new Float64Array(p);
  for (let i = 0; i < p; i++) {
    let v = g[i]!;
    for (let k = 0; k < i; k++) v -= R[k * p + i]! * qtb[k]!;
    qtb[i] = v / R[i * p + i]!;
  }
  return { R, qtb, G, g };
}

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

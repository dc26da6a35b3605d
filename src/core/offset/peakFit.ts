// Sub-node position of a score peak: a least-squares quadratic surface
// f = a + b x + c y + d x^2 + e x y + g y^2 over the nodes around the best one, and the
// stationary point of that surface. The parabolic peak fit is the usual sub-pixel
// estimator of correlation peaks in image registration and PIV (e.g. Raffel, Willert,
// Wereley & Kompenhans 2007, Particle Image Velocimetry: A Practical Guide, 2nd ed.,
// on sub-pixel peak estimators; cited from memory).

export interface PeakFit {
  /** Peak offset from the best node, in node steps (x east, y north). */
  x: number;
  y: number;
  /** Second derivatives of the fitted surface, per step squared. */
  hessian: [number, number, number];
  /** True when the fitted surface has a maximum within one step of the best node. */
  ok: boolean;
}

/** Solves A x = b (n x n, row-major) by Gaussian elimination with partial pivoting. */
export function solve(a: number[], b: number[], n: number): number[] | null {
  const m = a.slice();
  const v = b.slice();
  for (let col = 0; col < n; col++) {
    let pivot = col;
    for (let r = col + 1; r < n; r++) if (Math.abs(m[r * n + col]) > Math.abs(m[pivot * n + col])) pivot = r;
    if (Math.abs(m[pivot * n + col]) < 1e-14) return null;
    if (pivot !== col) {
      for (let c = 0; c < n; c++) [m[col * n + c], m[pivot * n + c]] = [m[pivot * n + c], m[col * n + c]];
      [v[col], v[pivot]] = [v[pivot], v[col]];
    }
    for (let r = col + 1; r < n; r++) {
      const f = m[r * n + col] / m[col * n + col];
      for (let c = col; c < n; c++) m[r * n + c] -= f * m[col * n + c];
      v[r] -= f * v[col];
    }
  }
  const x = new Array<number>(n).fill(0);
  for (let r = n - 1; r >= 0; r--) {
    let s = v[r];
    for (let c = r + 1; c < n; c++) s -= m[r * n + c] * x[c];
    x[r] = s / m[r * n + r];
  }
  return x;
}

/**
 * Fits the peak around node (col, row) of a side x side surface (row 0 south), using
 * the finite nodes within `reach` steps. Needs at least six of them.
 */
export function fitPeak(surface: ArrayLike<number>, side: number, col: number, row: number, reach = 1): PeakFit {
  const ata = new Array<number>(36).fill(0);
  const atb = new Array<number>(6).fill(0);
  let used = 0;
  for (let dy = -reach; dy <= reach; dy++) {
    for (let dx = -reach; dx <= reach; dx++) {
      const c = col + dx;
      const r = row + dy;
      if (c < 0 || r < 0 || c >= side || r >= side) continue;
      const f = surface[r * side + c];
      if (!Number.isFinite(f)) continue;
      const basis = [1, dx, dy, dx * dx, dx * dy, dy * dy];
      for (let i = 0; i < 6; i++) {
        atb[i] += basis[i] * f;
        for (let j = 0; j < 6; j++) ata[i * 6 + j] += basis[i] * basis[j];
      }
      used++;
    }
  }
  const none: PeakFit = { x: 0, y: 0, hessian: [0, 0, 0], ok: false };
  if (used < 6) return none;
  const p = solve(ata, atb, 6);
  if (!p) return none;
  const [, b, c, d, e, g] = p;
  const hxx = 2 * d;
  const hxy = e;
  const hyy = 2 * g;
  const det = hxx * hyy - hxy * hxy;
  // A maximum needs a negative-definite Hessian.
  if (!(hxx < 0 && det > 0)) return { ...none, hessian: [hxx, hxy, hyy] };
  const x = (-b * hyy + c * hxy) / det;
  const y = (b * hxy - c * hxx) / det;
  const ok = Math.abs(x) <= 1 && Math.abs(y) <= 1;
  return { x: ok ? x : 0, y: ok ? y : 0, hessian: [hxx, hxy, hyy], ok };
}

/**
 * Dense linear algebra for the handful-of-unknowns problems of the quick methods
 * (conductance-peak fit, C0 regression, load-shift lines, temperature polynomials).
 * Gaussian elimination with partial pivoting; matrices are arrays of rows.
 */

/** Solve A·x = b; undefined when A is singular to working precision. A and b are not modified. */
export function solveSmall(a: number[][], b: number[]): number[] | undefined {
  const inv = invertSmall(a);
  if (!inv) return undefined;
  return inv.map((row) => row.reduce((s, v, j) => s + v * b[j], 0));
}

/** Inverse of a small square matrix, or undefined when singular to working precision. */
export function invertSmall(a: number[][]): number[][] | undefined {
  const n = a.length;
  // Scale rows and columns by the diagonal so that badly scaled normal equations still pivot well.
  const s = a.map((row, i) => (row[i] > 0 ? 1 / Math.sqrt(row[i]) : 1));
  const m = a.map((row, i) => [...row.map((v, j) => v * s[i] * s[j]), ...row.map((_, j) => (i === j ? 1 : 0))]);
  for (let c = 0; c < n; c++) {
    let p = c;
    for (let r = c + 1; r < n; r++) if (Math.abs(m[r][c]) > Math.abs(m[p][c])) p = r;
    if (!(Math.abs(m[p][c]) > 1e-14)) return undefined;
    [m[c], m[p]] = [m[p], m[c]];
    const piv = m[c][c];
    for (let j = 0; j < 2 * n; j++) m[c][j] /= piv;
    for (let r = 0; r < n; r++) {
      if (r === c) continue;
      const f = m[r][c];
      if (f === 0) continue;
      for (let j = 0; j < 2 * n; j++) m[r][j] -= f * m[c][j];
    }
  }
  const out = m.map((row) => row.slice(n));
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) out[i][j] *= s[i] * s[j];
  if (!out.every((row) => row.every(Number.isFinite))) return undefined;
  return out;
}

/**
 * Weighted linear least squares: minimise Σ wᵢ(yᵢ − Σⱼ xᵢⱼβⱼ)².
 * Returns β, its covariance scaled by the residual variance (n − p degrees of freedom;
 * unscaled when n = p), the residual RMS (weighted) and the degrees of freedom.
 */
export function linearLeastSquares(
  rows: number[][],
  y: number[],
  w?: number[],
): { beta: number[]; covariance: number[][]; rms: number; dof: number } | undefined {
  const n = rows.length;
  if (n === 0) return undefined;
  const p = rows[0].length;
  if (n < p) return undefined;
  const ata = Array.from({ length: p }, () => new Array<number>(p).fill(0));
  const aty = new Array<number>(p).fill(0);
  for (let i = 0; i < n; i++) {
    const wi = w ? w[i] : 1;
    const r = rows[i];
    for (let a = 0; a < p; a++) {
      aty[a] += wi * r[a] * y[i];
      for (let b = a; b < p; b++) ata[a][b] += wi * r[a] * r[b];
    }
  }
  for (let a = 0; a < p; a++) for (let b = 0; b < a; b++) ata[a][b] = ata[b][a];
  const inv = invertSmall(ata);
  if (!inv) return undefined;
  const beta = inv.map((row) => row.reduce((s, v, j) => s + v * aty[j], 0));
  let ss = 0;
  for (let i = 0; i < n; i++) {
    const fit = rows[i].reduce((s, v, j) => s + v * beta[j], 0);
    ss += (w ? w[i] : 1) * (y[i] - fit) ** 2;
  }
  const dof = n - p;
  const s2 = dof > 0 ? ss / dof : 1;
  const covariance = inv.map((row) => row.map((v) => v * s2));
  return { beta, covariance, rms: Math.sqrt(ss / n), dof };
}

/** Standard uncertainty of f(β) by first-order propagation: √(gᵀ·Cov·g). */
export function propagate(gradient: number[], covariance: number[][]): number {
  let s = 0;
  for (let i = 0; i < gradient.length; i++)
    for (let j = 0; j < gradient.length; j++) s += gradient[i] * covariance[i][j] * gradient[j];
  return Math.sqrt(Math.max(0, s));
}

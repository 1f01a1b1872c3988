/**
 * Levenberg–Marquardt for small, dense nonlinear least squares: minimise SSR(x) = ‖r(x)‖².
 *
 * Classic damping (K. Levenberg 1944; D. W. Marquardt, SIAM J. Appl. Math. 1963), no geodesic acceleration:
 * each iteration solves (JᵀJ + λ·diag(JᵀJ)) δ = −Jᵀr. The system is scaled to unit diagonal
 * first (Â = D⁻¹JᵀJD⁻¹, D = column norms of J), which makes the step independent of parameter
 * units and lets a plain Cholesky factorisation work for n up to a few dozen. A step is taken
 * when it lowers SSR (then λ ← λ/10), otherwise λ ← 10λ and the step is retried.
 *
 * Stopping rules (see {@link StopRule}); thresholds live in {@link LM_DEFAULTS}:
 * - `zero-residual`: SSR is exactly zero.
 * - `relative-offset`: the part of r that a linear change of the parameters could still remove,
 *   ‖P r‖ (P = projection onto the range of J; ‖P r‖² = gᵀ(JᵀJ)⁻¹g), is negligible against the
 *   residual scatter: √(‖P r‖²/n) / √(SSR/(m − n)) ≤ offsetTolerance. This is the relative-offset
 *   criterion of Bates & Watts (Technometrics 23, 1981): the remaining distance to the minimum
 *   is that fraction of one standard error. It is unit-free and needs no trial step.
 * - `parameter-step`: an accepted step moved every parameter by |δᵢ| ≤ stepTolerance·sᵢ, with
 *   sᵢ = typicalX[i] when given, else max(|xᵢ|, 1) (ends fits to noiseless data).
 * - `no-reduction`: λ exceeded maxDamping without any step lowering SSR: x is a minimum to
 *   working precision (another usual end of a fit to noiseless data).
 * Failures: `max-iterations`, `non-finite` (residuals or Jacobian), `singular` (a parameter
 * without effect, or JᵀJ not positive definite at the solution, so no covariance).
 *
 * The Jacobian is stored column-major (one column per parameter), so the normal equations are
 * built from contiguous dot products. Work arrays are allocated once per call; the loop itself
 * allocates nothing.
 */

/** A residual vector and its Jacobian, supplied by the caller. */
export interface LeastSquaresProblem {
  /** Number of residuals m. */
  readonly residualCount: number;
  /** Number of parameters n (n < m). */
  readonly parameterCount: number;
  /** Fill r (length m) at x. Return false when r cannot be evaluated (non-finite values). */
  residuals(x: Float64Array, r: Float64Array): boolean;
  /** Fill r and the column-major Jacobian jac[j·m + i] = ∂rᵢ/∂xⱼ at x. Return false if r is not finite (a non-finite Jacobian is caught by the optimiser). */
  residualsAndJacobian(x: Float64Array, r: Float64Array, jac: Float64Array): boolean;
  /** Optional: a reason when x lies outside the region the model may be evaluated in, else null. */
  infeasibility?(x: Float64Array): string | null;
  /** Optional typical magnitude of each parameter for the `parameter-step` rule. */
  readonly typicalX?: Float64Array;
}

/** Tuning of {@link levenbergMarquardt}; every field has a default in {@link LM_DEFAULTS}. */
export interface LevenbergMarquardtOptions {
  /** Maximum number of steps (Jacobian evaluations after the first). */
  maxIterations: number;
  /** Threshold of the `relative-offset` rule, in standard errors. */
  offsetTolerance: number;
  /** Relative threshold of the `parameter-step` rule. */
  stepTolerance: number;
  /** λ at the start (relative to the unit diagonal of the scaled normal matrix). */
  initialDamping: number;
  /** Smallest λ kept after successful steps. */
  minDamping: number;
  /** λ above which no further reduction is deemed possible. */
  maxDamping: number;
  /** Smallest pivot of the scaled normal matrix (unit diagonal) still treated as non-singular. */
  singularPivot: number;
}

/** Default tuning (see the module comment for what each threshold means). */
export const LM_DEFAULTS: Readonly<LevenbergMarquardtOptions> = Object.freeze({
  maxIterations: 200,
  // 1e-6 standard errors: far below any reported digit, well above rounding of gᵀ(JᵀJ)⁻¹g.
  offsetTolerance: 1e-6,
  stepTolerance: 1e-12,
  initialDamping: 1e-3,
  minDamping: 1e-12,
  maxDamping: 1e16,
  // Â has unit diagonal, so a pivot of 1e-14 means a condition number near 1e14: the
  // covariance would carry no correct digit.
  singularPivot: 1e-14,
});

/** Why the iteration stopped. */
export type StopRule =
  | 'zero-residual'
  | 'relative-offset'
  | 'parameter-step'
  | 'no-reduction'
  | 'max-iterations'
  | 'non-finite'
  | 'singular';

/** Outcome of {@link levenbergMarquardt}. */
export interface LevenbergMarquardtResult {
  /** Best parameters found (the start when evaluation failed there). */
  x: Float64Array;
  converged: boolean;
  stop: StopRule;
  /** Terse human-readable reason. */
  reason: string;
  /** Steps taken (accepted or not, counted once per Jacobian). */
  iterations: number;
  /** Residual evaluations in all. */
  evaluations: number;
  /** Sum of squared residuals at x. */
  ssr: number;
  /** Residuals at x (length m). */
  r: Float64Array;
  /** (JᵀJ)⁻¹ at x, row-major n×n; null when not converged or singular. */
  inverseNormal: Float64Array | null;
}

/**
 * Cholesky factorisation L·Lᵀ in place of a symmetric n×n row-major matrix (lower triangle used).
 * Returns the smallest pivot (before the square root); ≤ 0 or NaN means not positive definite,
 * and the factorisation stops there.
 */
export function choleskyInPlace(a: Float64Array, n: number): number {
  let minPivot = Infinity;
  for (let j = 0; j < n; j++) {
    let s = a[j * n + j];
    for (let k = 0; k < j; k++) s -= a[j * n + k] * a[j * n + k];
    if (!(s > 0)) return s;
    if (s < minPivot) minPivot = s;
    const d = Math.sqrt(s);
    a[j * n + j] = d;
    for (let i = j + 1; i < n; i++) {
      let t = a[i * n + j];
      for (let k = 0; k < j; k++) t -= a[i * n + k] * a[j * n + k];
      a[i * n + j] = t / d;
    }
  }
  return minPivot;
}

/** Solve L·Lᵀ·y = b in place (b becomes y), L from {@link choleskyInPlace}. */
export function choleskySolveInPlace(l: Float64Array, n: number, b: Float64Array): void {
  for (let i = 0; i < n; i++) {
    let s = b[i];
    for (let k = 0; k < i; k++) s -= l[i * n + k] * b[k];
    b[i] = s / l[i * n + i];
  }
  for (let i = n - 1; i >= 0; i--) {
    let s = b[i];
    for (let k = i + 1; k < n; k++) s -= l[k * n + i] * b[k];
    b[i] = s / l[i * n + i];
  }
}

function sumSquares(r: Float64Array): number {
  let s = 0;
  for (let i = 0; i < r.length; i++) s += r[i] * r[i];
  return s;
}

/**
 * Normal equations from a column-major Jacobian: a = JᵀJ (n×n), g = Jᵀr, d = column norms.
 * Returns −1 when all is well, −2 when a sum is not finite, else the index of a parameter
 * without effect (zero column).
 */
function normalEquations(
  jac: Float64Array,
  r: Float64Array,
  m: number,
  n: number,
  a: Float64Array,
  g: Float64Array,
  d: Float64Array,
): number {
  let check = 0;
  for (let p = 0; p < n; p++) {
    const cp = p * m;
    let sg = 0;
    for (let i = 0; i < m; i++) sg += jac[cp + i] * r[i];
    g[p] = sg;
    check += sg - sg;
    // Four columns q at a time against column p (q ≤ p), so column p is read once per block.
    let q = 0;
    for (; q + 3 <= p; q += 4) {
      const c0 = q * m;
      const c1 = c0 + m;
      const c2 = c1 + m;
      const c3 = c2 + m;
      let s0 = 0;
      let s1 = 0;
      let s2 = 0;
      let s3 = 0;
      for (let i = 0; i < m; i++) {
        const v = jac[cp + i];
        s0 += v * jac[c0 + i];
        s1 += v * jac[c1 + i];
        s2 += v * jac[c2 + i];
        s3 += v * jac[c3 + i];
      }
      a[p * n + q] = a[q * n + p] = s0;
      a[p * n + q + 1] = a[(q + 1) * n + p] = s1;
      a[p * n + q + 2] = a[(q + 2) * n + p] = s2;
      a[p * n + q + 3] = a[(q + 3) * n + p] = s3;
      check += s0 - s0 + (s1 - s1) + (s2 - s2) + (s3 - s3);
    }
    for (; q <= p; q++) {
      const cq = q * m;
      let s = 0;
      for (let i = 0; i < m; i++) s += jac[cp + i] * jac[cq + i];
      a[p * n + q] = a[q * n + p] = s;
      check += s - s;
    }
  }
  if (check !== 0) return -2; // NaN: something was not finite
  for (let p = 0; p < n; p++) {
    d[p] = Math.sqrt(a[p * n + p]);
    if (!(d[p] > 0)) return p;
  }
  return -1;
}

/**
 * Minimise ‖r(x)‖² from x0. Never throws for numerical trouble: failure is reported in the result.
 */
export function levenbergMarquardt(
  problem: LeastSquaresProblem,
  x0: Float64Array,
  options: Partial<LevenbergMarquardtOptions> = {},
): LevenbergMarquardtResult {
  const o: LevenbergMarquardtOptions = { ...LM_DEFAULTS, ...options };
  const m = problem.residualCount;
  const n = problem.parameterCount;
  const x = Float64Array.from(x0);
  const xt = new Float64Array(n);
  // Current point (r, jac) and trial point (rt, jt); swapped when a trial is accepted.
  let r = new Float64Array(m);
  let rt = new Float64Array(m);
  let jac = new Float64Array(m * n);
  let jt = new Float64Array(m * n);
  const a = new Float64Array(n * n); // JᵀJ
  const g = new Float64Array(n); // Jᵀr
  const d = new Float64Array(n); // column norms of J
  const lhs = new Float64Array(n * n);
  const step = new Float64Array(n);
  const typical = problem.typicalX;

  let evaluations = 1;
  let iterations = 0;
  let ssr = Infinity;
  const result = (converged: boolean, stop: StopRule, reason: string): LevenbergMarquardtResult => ({
    x,
    converged,
    stop,
    reason,
    iterations,
    evaluations,
    ssr,
    r,
    inverseNormal: null,
  });

  const formNormal = (): number => normalEquations(jac, r, m, n, a, g, d);

  /** Scaled normal matrix plus λ on the diagonal into lhs, factorised; returns the smallest pivot. */
  const factor = (lambda: number): number => {
    for (let p = 0; p < n; p++) {
      for (let q = 0; q <= p; q++) lhs[p * n + q] = a[p * n + q] / (d[p] * d[q]);
      lhs[p * n + p] += lambda;
    }
    return choleskyInPlace(lhs, n);
  };

  if (!problem.residualsAndJacobian(x, r, jac)) {
    return result(false, 'non-finite', 'residuals not finite at the start values');
  }
  ssr = sumSquares(r);
  if (!Number.isFinite(ssr)) return result(false, 'non-finite', 'residuals not finite at the start values');

  let lambda = o.initialDamping;
  let stop: StopRule = 'max-iterations';
  let reason = `no convergence in ${o.maxIterations} iterations`;
  let converged = false;

  outer: while (true) {
    if (ssr === 0) {
      stop = 'zero-residual';
      reason = 'residuals are exactly zero';
      converged = true;
      break;
    }
    const dead = formNormal();
    if (dead === -2) {
      stop = 'non-finite';
      reason = 'jacobian not finite';
      break;
    }
    if (dead >= 0) {
      stop = 'singular';
      reason = `parameter ${dead} has no effect on the residuals`;
      break;
    }
    // Relative offset (Bates & Watts 1981) from the undamped Gauss–Newton system.
    if (factor(0) > 0) {
      for (let p = 0; p < n; p++) step[p] = g[p] / d[p];
      choleskySolveInPlace(lhs, n, step);
      let offset2 = 0;
      for (let p = 0; p < n; p++) offset2 += (step[p] * g[p]) / d[p];
      const relOffset = Math.sqrt(Math.max(offset2, 0) / n / (ssr / (m - n)));
      if (relOffset <= o.offsetTolerance) {
        stop = 'relative-offset';
        reason = `relative offset ${relOffset.toExponential(2)} ≤ ${o.offsetTolerance}`;
        converged = true;
        break;
      }
    }
    if (iterations >= o.maxIterations) break;
    iterations++;

    // Inner loop: raise λ until a step lowers SSR.
    while (true) {
      let accepted = false;
      let newSsr = Infinity;
      if (factor(lambda) > 0) {
        for (let p = 0; p < n; p++) step[p] = -g[p] / d[p];
        choleskySolveInPlace(lhs, n, step);
        for (let p = 0; p < n; p++) {
          step[p] /= d[p];
          xt[p] = x[p] + step[p];
        }
        const infeasible = problem.infeasibility ? problem.infeasibility(xt) : null;
        if (infeasible === null) {
          evaluations++;
          // The Jacobian comes along: most trials are accepted, and it then need not be recomputed.
          if (problem.residualsAndJacobian(xt, rt, jt)) {
            newSsr = sumSquares(rt);
            accepted = Number.isFinite(newSsr) && newSsr < ssr;
          }
        }
      }
      if (accepted) {
        let smallStep = true;
        for (let p = 0; p < n; p++) {
          const scale = typical ? typical[p] : Math.max(Math.abs(x[p]), 1);
          if (Math.abs(step[p]) > o.stepTolerance * scale) smallStep = false;
        }
        x.set(xt);
        [r, rt] = [rt, r];
        [jac, jt] = [jt, jac];
        ssr = newSsr;
        lambda = Math.max(lambda / 10, o.minDamping);
        if (smallStep) {
          stop = 'parameter-step';
          reason = `relative parameter step ≤ ${o.stepTolerance}`;
          converged = true;
          break outer;
        }
        continue outer;
      }
      lambda *= 10;
      if (lambda > o.maxDamping) {
        stop = 'no-reduction';
        reason = 'no step lowers the residual further (minimum to working precision)';
        converged = true;
        break outer;
      }
    }
  }

  const out = result(converged, stop, reason);
  if (!converged) return out;

  // Covariance factor (JᵀJ)⁻¹ at the solution, through the unit-diagonal scaling.
  const dead = formNormal();
  if (dead === -2) {
    out.converged = false;
    out.stop = 'non-finite';
    out.reason = 'jacobian not finite at the solution';
    return out;
  }
  if (dead >= 0) {
    out.converged = false;
    out.stop = 'singular';
    out.reason = `parameter ${dead} has no effect on the residuals at the solution`;
    return out;
  }
  const pivot = factor(0);
  if (!(pivot > o.singularPivot)) {
    out.converged = false;
    out.stop = 'singular';
    out.reason = `normal matrix singular at the solution (smallest scaled pivot ${Number.isFinite(pivot) ? pivot.toExponential(1) : String(pivot)})`;
    return out;
  }
  const inv = new Float64Array(n * n);
  const col = new Float64Array(n);
  for (let q = 0; q < n; q++) {
    col.fill(0);
    col[q] = 1;
    choleskySolveInPlace(lhs, n, col);
    for (let p = 0; p < n; p++) inv[p * n + q] = col[p] / (d[p] * d[q]);
  }
  // Exact symmetry (the column solves differ in the last bits).
  for (let p = 0; p < n; p++) {
    for (let q = 0; q < p; q++) {
      const v = 0.5 * (inv[p * n + q] + inv[q * n + p]);
      inv[p * n + q] = v;
      inv[q * n + p] = v;
    }
  }
  out.inverseNormal = inv;
  return out;
}

/**
 * Locating a level crossing between sweep points: quadratic interpolation through three
 * neighbouring points, in local coordinates so that sub-hertz detail survives at MHz
 * frequencies; linear interpolation as the fallback.
 */

/**
 * Newton form of the quadratic through three points, in coordinates local to x0:
 * y = y0 + d1·u + d2·u·(u − u1), u = x − x0.
 */
function newtonQuadratic(
  xs: readonly number[],
  ys: readonly number[],
): { x0: number; y0: number; u1: number; d1: number; d2: number } {
  const [x0, x1, x2] = xs;
  const [y0, y1, y2] = ys;
  const u1 = x1 - x0;
  const u2 = x2 - x0;
  const d1 = (y1 - y0) / u1;
  const d2 = ((y2 - y1) / (u2 - u1) - d1) / u2;
  return { x0, y0, u1, d1, d2 };
}

/**
 * x where the quadratic through (xs[k], ys[k]), k = 0..2, equals `target`, restricted to
 * [a, b] (either order); undefined when no root lies there.
 */
export function quadraticCrossing(
  xs: readonly number[],
  ys: readonly number[],
  target: number,
  a: number,
  b: number,
): number | undefined {
  const { x0, y0, u1, d1, d2 } = newtonQuadratic(xs, ys);
  // y = y0 + d1·u + d2·u·(u − u1) = A·u² + B·u + C + target
  const A = d2;
  const B = d1 - d2 * u1;
  const C = y0 - target;
  const lo = Math.min(a, b) - x0;
  const hi = Math.max(a, b) - x0;
  const roots: number[] = [];
  if (!Number.isFinite(A) || !Number.isFinite(B)) return undefined;
  if (A === 0 || Math.abs(A) * (hi - lo) < 1e-12 * Math.abs(B)) {
    if (B !== 0) roots.push(-C / B);
  } else {
    const disc = B * B - 4 * A * C;
    if (disc < 0) return undefined;
    const sq = Math.sqrt(disc);
    const qv = -0.5 * (B + (B >= 0 ? sq : -sq));
    roots.push(qv / A);
    if (qv !== 0) roots.push(C / qv);
  }
  const eps = 1e-9 * (hi - lo);
  const inside = roots.filter((r) => r >= lo - eps && r <= hi + eps);
  if (inside.length === 0) return undefined;
  return x0 + Math.min(Math.max(inside[0], lo), hi);
}

/**
 * Frequency between indices `i` and `i + 1` where `y` crosses `target`, from the quadratic
 * through those two points and the better-placed neighbour (linear when that fails).
 */
export function crossingBetween(x: ArrayLike<number>, y: ArrayLike<number>, i: number, target: number): number {
  const n = x.length;
  const third = i + 2 < n ? i + 2 : i - 1;
  if (third >= 0 && third < n) {
    const idx = [i, i + 1, third].sort((p, q) => p - q);
    const r = quadraticCrossing(
      idx.map((k) => x[k]),
      idx.map((k) => y[k]),
      target,
      x[i],
      x[i + 1],
    );
    if (r !== undefined) {
      // Prefer the side whose neighbour is closer in value when both exist: check the other triple too.
      const other = i - 1 >= 0 && third !== i - 1 ? i - 1 : -1;
      if (other < 0) return r;
      const r2 = quadraticCrossing([x[other], x[i], x[i + 1]], [y[other], y[i], y[i + 1]], target, x[i], x[i + 1]);
      return r2 === undefined ? r : 0.5 * (r + r2);
    }
  }
  const t = (target - y[i]) / (y[i + 1] - y[i]);
  return x[i] + t * (x[i + 1] - x[i]);
}

/** Vertex of the parabola through three points (x of the extremum), or undefined if degenerate. */
export function parabolaVertex(xs: readonly number[], ys: readonly number[]): { x: number; y: number } | undefined {
  const { x0, y0, u1, d1, d2 } = newtonQuadratic(xs, ys);
  if (!(d2 !== 0) || !Number.isFinite(d2)) return undefined;
  const uv = (d2 * u1 - d1) / (2 * d2);
  const yv = y0 + d1 * uv + d2 * uv * (uv - u1);
  return { x: x0 + uv, y: yv };
}

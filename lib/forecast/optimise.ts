/**
 * A bounded Nelder–Mead minimiser (pure TypeScript, no framework imports).
 *
 * Generic: used by the exponential-smoothing family and usable by any other method that
 * needs to minimise a cheap function of a few variables within box bounds.
 */

/** Options for {@link minimise}. */
export interface MinimiseOptions {
  /** Lower box bounds, one per variable (default −∞). */
  readonly lower?: readonly number[];
  /** Upper box bounds, one per variable (default +∞). */
  readonly upper?: readonly number[];
  /** Initial simplex step per variable (default 10% of |x0| or of the bounded range, at least 1e-3). */
  readonly step?: readonly number[];
  /** Maximum number of function evaluations over all restarts (default 200·(d + 1)², at least 2000). */
  readonly maxIter?: number;
  /** Relative tolerance on the spread of function values in the simplex (default 1e-10). */
  readonly tol?: number;
  /** Absolute tolerance on the spread of function values (default 1e-300). */
  readonly absTol?: number;
  /** How many times to restart from the best point with a fresh simplex (default 2). */
  readonly restarts?: number;
}

/** Result of {@link minimise}. */
export interface MinimiseResult {
  /** Best point found (inside the bounds). */
  readonly x: number[];
  /** f(x). */
  readonly value: number;
  /** Function evaluations used. */
  readonly evaluations: number;
  /** Whether the tolerance was met (false when the evaluation budget ran out first). */
  readonly converged: boolean;
}

/** Nelder–Mead coefficients (Nelder & Mead 1965; standard values, Lagarias et al. 1998). */
const REFLECT = 1;
const EXPAND = 2;
const CONTRACT = 0.5;
const SHRINK = 0.5;

/**
 * Minimise `f` over a box with the Nelder–Mead simplex method.
 *
 * Definition: the downhill simplex method of Nelder, J. A. & Mead, R. (1965), "A simplex
 * method for function minimization", Computer Journal 7(4), 308–313, with the standard
 * coefficients (reflection 1, expansion 2, contraction ½, shrink ½; see Lagarias, Reeds,
 * Wright & Wright 1998, SIAM J. Optim. 9(1), 112–147). Box bounds are enforced by projecting
 * every trial point onto the box; other constraints can be expressed by returning
 * `Infinity` from `f` (the start must then be feasible). After convergence the search is
 * restarted from the best point with a fresh simplex (a common remedy for Nelder–Mead's
 * premature collapse), until a restart no longer improves the value or `restarts` is used up.
 *
 * Performance: `f` receives one reused `Float64Array`; it must not keep a reference to it.
 * No allocation happens inside the iteration loop.
 *
 * Input: `x0` non-empty, finite; bounds (if given) of the same length with lower ≤ upper.
 * `x0` is projected onto the box first. With zero variables, returns f at the empty point.
 * A NaN returned by `f` is treated as +∞.
 * @throws RangeError if lengths differ, a bound pair is reversed, or x0 has a non-finite entry.
 * @example minimise((x) => (x[0] - 1) ** 2 + (x[1] + 2) ** 2, [0, 0]).x // ≈ [1, -2]
 */
export function minimise(
  f: (x: Float64Array) => number,
  x0: readonly number[],
  options: MinimiseOptions = {},
): MinimiseResult {
  const d = x0.length;
  const lower = options.lower ?? new Array<number>(d).fill(-Infinity);
  const upper = options.upper ?? new Array<number>(d).fill(Infinity);
  if (lower.length !== d || upper.length !== d) {
    throw new RangeError(`minimise: bounds must have ${d} entries, like x0`);
  }
  for (let i = 0; i < d; i++) {
    if (!Number.isFinite(x0[i])) throw new RangeError(`minimise: x0[${i}] is not a finite number`);
    if (!(lower[i] <= upper[i])) {
      throw new RangeError(`minimise: lower bound must be below the upper bound (variable ${i})`);
    }
  }
  const maxEval = options.maxIter ?? Math.max(2000, 200 * (d + 1) * (d + 1));
  const tol = options.tol ?? 1e-10;
  const absTol = options.absTol ?? 1e-300;
  const restarts = options.restarts ?? 2;

  const lo = Float64Array.from(lower);
  const hi = Float64Array.from(upper);
  const trial = new Float64Array(d);
  let evaluations = 0;
  const evalAt = (x: Float64Array): number => {
    evaluations++;
    const v = f(x);
    return Number.isNaN(v) ? Infinity : v;
  };

  const best = new Float64Array(d);
  for (let i = 0; i < d; i++) best[i] = Math.min(hi[i], Math.max(lo[i], x0[i]));
  trial.set(best);
  let bestValue = evalAt(trial);
  if (d === 0) return { x: [], value: bestValue, evaluations, converged: true };

  const step = new Float64Array(d);
  for (let i = 0; i < d; i++) {
    let s = options.step?.[i];
    if (s === undefined || !(s > 0)) {
      const range = hi[i] - lo[i];
      s = Number.isFinite(range) ? 0.1 * range : 0.1 * Math.abs(best[i]);
      if (!(s >= 1e-3)) s = Math.max(s, 1e-3);
      if (Number.isFinite(range)) s = Math.min(s, range);
    }
    step[i] = s;
  }

  // Simplex: (d + 1) vertices stored row-wise.
  const n1 = d + 1;
  const simplex = new Float64Array(n1 * d);
  const values = new Float64Array(n1);
  const centroid = new Float64Array(d);
  // Column sums of the simplex, kept up to date as vertices are replaced (O(d) per step instead
  // of O(d²) for the centroid), recomputed from the vertices after a shrink and every 4(d + 1) steps.
  const sum = new Float64Array(d);
  const resum = (): void => {
    sum.fill(0);
    for (let v = 0; v < n1; v++) for (let i = 0, row = v * d; i < d; i++) sum[i] += simplex[row + i];
  };
  /** Replaces the vertex starting at `row` by x (value fx), keeping the column sums. */
  const replace = (row: number, x: Float64Array, fx: number, v: number): void => {
    for (let i = 0; i < d; i++) {
      sum[i] += x[i] - simplex[row + i];
      simplex[row + i] = x[i];
    }
    values[v] = fx;
  };
  const xr = new Float64Array(d);
  const xe = new Float64Array(d);
  const xc = new Float64Array(d);

  const project = (x: Float64Array): void => {
    for (let i = 0; i < d; i++) {
      if (x[i] < lo[i]) x[i] = lo[i];
      else if (x[i] > hi[i]) x[i] = hi[i];
    }
  };

  let converged = false;
  for (let round = 0; round <= restarts && evaluations < maxEval; round++) {
    const scale = round === 0 ? 1 : 0.5 ** round;
    // Build the simplex around `best`.
    for (let i = 0; i < d; i++) simplex[i] = best[i];
    values[0] = bestValue;
    for (let v = 1; v < n1; v++) {
      const row = v * d;
      for (let i = 0; i < d; i++) simplex[row + i] = best[i];
      const j = v - 1;
      let s = step[j] * scale;
      if (best[j] + s > hi[j]) s = -s;
      let xj = best[j] + s;
      if (xj < lo[j]) xj = lo[j];
      if (xj === best[j]) xj = Math.min(hi[j], best[j] + 1e-8 * (1 + Math.abs(best[j])));
      simplex[row + j] = xj;
      for (let i = 0; i < d; i++) trial[i] = simplex[row + i];
      values[v] = evalAt(trial);
    }

    const startValue = bestValue;
    converged = false;
    resum();
    let sinceSum = 0;
    while (evaluations < maxEval) {
      if (++sinceSum > 4 * n1) {
        resum();
        sinceSum = 0;
      }
      // Best, worst and second-worst vertex: the first and the last two of the vertices sorted
      // by value, ties in vertex order (values are never NaN, so this is a total order), found
      // in one pass each.
      let iBest = 0;
      let iWorst = 0;
      for (let v = 1; v < n1; v++) {
        if (values[v] < values[iBest]) iBest = v;
        if (values[v] >= values[iWorst]) iWorst = v;
      }
      let iSecond = iWorst === 0 ? 1 : 0;
      for (let v = iSecond + 1; v < n1; v++) if (v !== iWorst && values[v] >= values[iSecond]) iSecond = v;
      const fBest = values[iBest];
      const fWorst = values[iWorst];
      if (
        Number.isFinite(fWorst) &&
        fWorst - fBest <= tol * (Math.abs(fBest) + Math.abs(fWorst)) * 0.5 + absTol
      ) {
        converged = true;
        break;
      }
      // Centroid of all but the worst.
      const wRow = iWorst * d;
      for (let i = 0; i < d; i++) centroid[i] = (sum[i] - simplex[wRow + i]) / d;
      // Reflection.
      for (let i = 0; i < d; i++) xr[i] = centroid[i] + REFLECT * (centroid[i] - simplex[wRow + i]);
      project(xr);
      const fr = evalAt(xr);
      if (fr < fBest) {
        for (let i = 0; i < d; i++) xe[i] = centroid[i] + EXPAND * (xr[i] - centroid[i]);
        project(xe);
        const fe = evalAt(xe);
        if (fe < fr) replace(wRow, xe, fe, iWorst);
        else replace(wRow, xr, fr, iWorst);
        continue;
      }
      if (fr < values[iSecond]) {
        replace(wRow, xr, fr, iWorst);
        continue;
      }
      // Contraction (outside if the reflected point beats the worst, else inside).
      const outside = fr < fWorst;
      for (let i = 0; i < d; i++) {
        xc[i] = outside
          ? centroid[i] + CONTRACT * (xr[i] - centroid[i])
          : centroid[i] + CONTRACT * (simplex[wRow + i] - centroid[i]);
      }
      project(xc);
      const fc = evalAt(xc);
      if (fc < (outside ? fr : fWorst)) {
        replace(wRow, xc, fc, iWorst);
        continue;
      }
      // Shrink towards the best vertex.
      const bRow = iBest * d;
      let moved = false;
      for (let v = 0; v < n1; v++) {
        if (v === iBest) continue;
        const row = v * d;
        for (let i = 0; i < d; i++) {
          const nv = simplex[bRow + i] + SHRINK * (simplex[row + i] - simplex[bRow + i]);
          if (nv !== simplex[row + i]) moved = true;
          simplex[row + i] = nv;
          trial[i] = nv;
        }
        values[v] = evalAt(trial);
      }
      resum();
      sinceSum = 0;
      if (!moved) {
        converged = true;
        break;
      }
    }
    // Keep the best vertex.
    let iBest = 0;
    for (let v = 1; v < n1; v++) if (values[v] < values[iBest]) iBest = v;
    if (values[iBest] <= bestValue) {
      bestValue = values[iBest];
      for (let i = 0; i < d; i++) best[i] = simplex[iBest * d + i];
    }
    if (round > 0 && !(bestValue < startValue - tol * Math.abs(startValue))) break;
  }
  return { x: Array.from(best), value: bestValue, evaluations, converged };
}

/** Golden-section ratio (3 − √5)/2 used by Brent's method. */
const GOLDEN = 0.3819660112501051;

/**
 * Minimise a function of one variable on [lower, upper]: a coarse grid of `grid` points
 * locates the best bracket (guarding against a local minimum), then Brent's method
 * (parabolic interpolation with golden-section steps; Brent, R. P. 1973, "Algorithms for
 * Minimization without Derivatives", ch. 5, the algorithm of R's `optimize`) refines it.
 *
 * Input: finite lower ≤ upper; `tol` the absolute tolerance on x (default 1e-10·(1 + |x|));
 * `grid` ≥ 3 (default 9). A NaN from f counts as +∞. lower = upper returns that point.
 * @throws RangeError for non-finite or reversed bounds.
 * @example minimiseScalar((x) => (x - 0.3) ** 2, 0, 1).x // ≈ 0.3
 */
export function minimiseScalar(
  f: (x: number) => number,
  lower: number,
  upper: number,
  options: { tol?: number; grid?: number; maxIter?: number } = {},
): { x: number; value: number; evaluations: number } {
  if (!Number.isFinite(lower) || !Number.isFinite(upper) || lower > upper) {
    throw new RangeError("minimiseScalar: lower bound must be below the upper bound, both finite");
  }
  let evaluations = 0;
  const fx = (x: number): number => {
    evaluations++;
    const v = f(x);
    return Number.isNaN(v) ? Infinity : v;
  };
  if (lower === upper) return { x: lower, value: fx(lower), evaluations };
  const grid = Math.max(3, options.grid ?? 9);
  const maxIter = options.maxIter ?? 200;
  let bestI = 0;
  let bestV = Infinity;
  const h = (upper - lower) / (grid - 1);
  for (let i = 0; i < grid; i++) {
    const v = fx(lower + i * h);
    if (v < bestV) {
      bestV = v;
      bestI = i;
    }
  }
  let a = lower + Math.max(0, bestI - 1) * h;
  let b = lower + Math.min(grid - 1, bestI + 1) * h;
  // Brent's method on [a, b] (as in Brent 1973 / R's optimize).
  let x = lower + bestI * h;
  let w = x;
  let v = x;
  let fxv = bestV;
  let fw = fxv;
  let fv = fxv;
  let d = 0;
  let e = 0;
  for (let iter = 0; iter < maxIter; iter++) {
    const xm = 0.5 * (a + b);
    const tol1 = (options.tol ?? 1e-10 * (1 + Math.abs(x))) + 1e-15 * Math.abs(x);
    const tol2 = 2 * tol1;
    if (Math.abs(x - xm) <= tol2 - 0.5 * (b - a)) break;
    let useGolden = true;
    if (Math.abs(e) > tol1) {
      const r = (x - w) * (fxv - fv);
      let q = (x - v) * (fxv - fw);
      let p = (x - v) * q - (x - w) * r;
      q = 2 * (q - r);
      if (q > 0) p = -p;
      else q = -q;
      const eTemp = e;
      e = d;
      if (Number.isFinite(p) && Math.abs(p) < Math.abs(0.5 * q * eTemp) && p > q * (a - x) && p < q * (b - x)) {
        d = p / q;
        const u = x + d;
        if (u - a < tol2 || b - u < tol2) d = xm >= x ? tol1 : -tol1;
        useGolden = false;
      }
    }
    if (useGolden) {
      e = x >= xm ? a - x : b - x;
      d = GOLDEN * e;
    }
    const u = Math.abs(d) >= tol1 ? x + d : x + (d > 0 ? tol1 : -tol1);
    const fu = fx(u);
    if (fu <= fxv) {
      if (u >= x) a = x;
      else b = x;
      v = w;
      fv = fw;
      w = x;
      fw = fxv;
      x = u;
      fxv = fu;
    } else {
      if (u < x) a = u;
      else b = u;
      if (fu <= fw || w === x) {
        v = w;
        fv = fw;
        w = u;
        fw = fu;
      } else if (fu <= fv || v === x || v === w) {
        v = u;
        fv = fu;
      }
    }
  }
  return { x, value: fxv, evaluations };
}

export default minimise;

import { assertProbability } from "./validate";

/** 1/√(2π). */
const M_1_SQRT_2PI = 0.398942280401432677939946059934;
/** √32, the boundary between Cody's second and third ranges. */
const SQRT_32 = 5.656854249492380195206754896838;

// W. J. Cody (1969) rational Chebyshev coefficients, as used in R's pnorm.c.
const A = [2.2352520354606839287, 161.02823106855587881, 1067.6894854603709582, 18154.981253343561249, 0.065682337918207449113];
const B = [47.20258190468824187, 976.09855173777669322, 10260.932208618978205, 45507.789335026729956];
const C = [
  0.39894151208813466764, 8.8831497943883759412, 93.506656132177855979, 597.27027639480026226,
  2494.5375852903726711, 6848.1904505362823326, 11602.651437647350124, 9842.7148383839780218,
  1.0765576773720192317e-8,
];
const D = [
  22.266688044328115691, 235.38790178262499861, 1519.377599407554805, 6485.558298266760755,
  18615.571640885098091, 34900.952721145977266, 38912.003286093271411, 19685.429676859990727,
];
const P = [0.21589853405795699, 0.1274011611602473639, 0.022235277870649807, 0.001421619193227893466, 2.9112874951168792e-5, 0.02307344176494017303];
const Q = [1.28426009614491121, 0.468238212480865118, 0.0659881378689285515, 0.00378239633202758244, 7.29751555083966205e-5];

/** exp(−x²/2) evaluated as exp(−xs²/2)·exp(−(x − xs)(x + xs)/2), xs = x rounded to 1/16 (Cody). */
function gaussTail(x: number, ratio: number): number {
  const xsq = Math.trunc(x * 16) / 16;
  const del = (x - xsq) * (x + xsq);
  return Math.exp(-xsq * xsq * 0.5) * Math.exp(-del * 0.5) * ratio;
}

/** Both tails: [P(Z ≤ x), P(Z > x)], each with full relative accuracy. */
function normalTails(x: number): [number, number] {
  const y = Math.abs(x);
  if (y <= 0.67448975) {
    let xnum = 0;
    let xden = 0;
    if (y > Number.EPSILON * 0.5) {
      const xsq = x * x;
      xnum = A[4] * xsq;
      xden = xsq;
      for (let i = 0; i < 3; i++) {
        xnum = (xnum + A[i]) * xsq;
        xden = (xden + B[i]) * xsq;
      }
    }
    const temp = (x * (xnum + A[3])) / (xden + B[3]);
    return [0.5 + temp, 0.5 - temp];
  }
  let small: number; // P(Z > |x|)
  if (y <= SQRT_32) {
    let xnum = C[8] * y;
    let xden = y;
    for (let i = 0; i < 7; i++) {
      xnum = (xnum + C[i]) * y;
      xden = (xden + D[i]) * y;
    }
    small = gaussTail(y, (xnum + C[7]) / (xden + D[7]));
  } else if (y < 37.5193) {
    const xsq = 1 / (x * x);
    let xnum = P[5] * xsq;
    let xden = xsq;
    for (let i = 0; i < 4; i++) {
      xnum = (xnum + P[i]) * xsq;
      xden = (xden + Q[i]) * xsq;
    }
    let temp = (xsq * (xnum + P[4])) / (xden + Q[4]);
    temp = (M_1_SQRT_2PI - temp) / y;
    small = gaussTail(y, temp);
  } else {
    small = 0; // below the smallest normal double, as R
  }
  return x > 0 ? [1 - small, small] : [small, 1 - small];
}

/**
 * Standard normal cumulative distribution function Φ(x) = P(Z ≤ x).
 *
 * Algorithm: W. J. Cody (1969), "Rational Chebyshev approximations for the error function",
 * Mathematics of Computation 23(107), 631–637, in the three-range form used by R's `pnorm`
 * (R Core, nmath/pnorm.c). Relative accuracy about 1e-15 in both tails; for x ≤ −37.5193 the
 * value underflows to 0.
 *
 * Input: any number; ±Infinity give 0 and 1. Complexity O(1).
 * @throws RangeError when x is NaN (policy in `index.ts`).
 * @example normalCdf(1.959963984540054) // 0.975
 */
export function normalCdf(x: number): number {
  if (Number.isNaN(x)) throw new RangeError("normalCdf: x is NaN");
  if (x === Infinity) return 1;
  if (x === -Infinity) return 0;
  return normalTails(x)[0];
}

/**
 * Standard normal upper tail 1 − Φ(x) = P(Z > x), computed directly (no cancellation), so
 * it keeps full relative accuracy for large x. Same algorithm and policy as {@link normalCdf}.
 * @throws RangeError when x is NaN.
 */
export function normalSurvival(x: number): number {
  if (Number.isNaN(x)) throw new RangeError("normalSurvival: x is NaN");
  if (x === Infinity) return 0;
  if (x === -Infinity) return 1;
  return normalTails(x)[1];
}

/**
 * Standard normal density φ(x) = exp(−x²/2)/√(2π).
 * @throws RangeError when x is NaN.
 */
export function normalDensity(x: number): number {
  if (Number.isNaN(x)) throw new RangeError("normalDensity: x is NaN");
  return M_1_SQRT_2PI * Math.exp(-0.5 * x * x);
}

/**
 * Standard normal quantile Φ⁻¹(p).
 *
 * Algorithm: M. J. Wichura (1988), "Algorithm AS 241: The percentage points of the normal
 * distribution", Applied Statistics 37(3), 477–484 — PPND16, rational approximations
 * accurate to about 1 part in 1e16, the algorithm behind R's `qnorm`.
 *
 * Input: p in [0, 1]; p = 0 gives −Infinity and p = 1 gives +Infinity (as R). Complexity O(1).
 * @throws RangeError when p is NaN or outside [0, 1] (policy in `index.ts`).
 * @example normalQuantile(0.975) // 1.959963984540054
 */
export function normalQuantile(p: number): number {
  assertProbability(p, "normalQuantile");
  if (p === 0) return -Infinity;
  if (p === 1) return Infinity;
  const q = p - 0.5;
  if (Math.abs(q) <= 0.425) {
    const r = 0.180625 - q * q;
    return (
      (q *
        (((((((r * 2509.0809287301226727 + 33430.575583588128105) * r + 67265.770927008700853) * r +
          45921.953931549871457) *
          r +
          13731.693765509461125) *
          r +
          1971.5909503065514427) *
          r +
          133.14166789178437745) *
          r +
          3.387132872796366608)) /
      (((((((r * 5226.495278852545925 + 28729.085735721942674) * r + 39307.89580009271061) * r +
        21213.794301586595867) *
        r +
        5394.1960214247511077) *
        r +
        687.1870074920579083) *
        r +
        42.313330701600911252) *
        r +
        1)
    );
  }
  let r = Math.sqrt(-Math.log(q < 0 ? p : 1 - p));
  let val: number;
  if (r <= 5) {
    r -= 1.6;
    val =
      (((((((r * 7.7454501427834140764e-4 + 0.0227238449892691845833) * r + 0.24178072517745061177) * r +
        1.27045825245236838258) *
        r +
        3.64784832476320460504) *
        r +
        5.7694972214606914055) *
        r +
        4.6303378461565452959) *
        r +
        1.42343711074968357734) /
      (((((((r * 1.05075007164441684324e-9 + 5.475938084995344946e-4) * r + 0.0151986665636164571966) * r +
        0.14810397642748007459) *
        r +
        0.68976733498510000455) *
        r +
        1.6763848301838038494) *
        r +
        2.05319162663775882187) *
        r +
        1);
  } else {
    r -= 5;
    val =
      (((((((r * 2.01033439929228813265e-7 + 2.71155556874348757815e-5) * r + 0.0012426609473880784386) * r +
        0.026532189526576123093) *
        r +
        0.29656057182850489123) *
        r +
        1.7848265399172913358) *
        r +
        5.4637849111641143699) *
        r +
        6.6579046435011037772) /
      (((((((r * 2.04426310338993978564e-15 + 1.4215117583164458887e-7) * r + 1.8463183175100546818e-5) * r +
        7.868691311456132591e-4) *
        r +
        0.0148753612908506148525) *
        r +
        0.13692988092273580531) *
        r +
        0.59983220655588793769) *
        r +
        1);
  }
  return q < 0 ? -val : val;
}

export default normalQuantile;

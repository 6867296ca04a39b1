/**
 * Special functions needed by the t distribution: log-gamma, log-beta and the regularised
 * incomplete beta function. Internal to lib/stats (not re-exported from `index.ts`); inputs
 * are trusted (positive, finite) and not checked.
 */

/** ln √(2π). */
const LN_SQRT_2PI = 0.918938533204672741780329736406;
/** ln √π = ln Γ(½). */
const LN_SQRT_PI = 0.572364942924700087071713675677;

// Lanczos approximation, g = 7, n = 9 (coefficients as published by P. Godfrey; see
// C. Lanczos 1964, SIAM J. Numer. Anal. B 1, 86–96). Relative error about 1e-15.
const LANCZOS_G = 7;
const LANCZOS = [
  0.99999999999980993, 676.5203681218851, -1259.1392167224028, 771.32342877765313, -176.61502916214059,
  12.507343278686905, -0.13857109526572012, 9.9843695780195716e-6, 1.5056327351493116e-7,
];

/** ln Γ(x) for x > 0 (Lanczos; x < 0.5 via ln Γ(x) = ln Γ(x + 1) − ln x). */
export function logGamma(x: number): number {
  if (x < 0.5) return logGamma(x + 1) - Math.log(x);
  const z = x - 1;
  let s = LANCZOS[0];
  for (let i = 1; i < LANCZOS.length; i++) s += LANCZOS[i] / (z + i);
  const t = z + LANCZOS_G + 0.5;
  return LN_SQRT_2PI + (z + 0.5) * Math.log(t) - t + Math.log(s);
}

/**
 * Stirling-series remainder ln Γ(x) − [(x − ½) ln x − x + ln √(2π)] for x ≥ 10, to x⁻¹³
 * (Abramowitz & Stegun 6.1.40); truncation error below 1e-17 there.
 */
function stirlingRemainder(x: number): number {
  const x2 = 1 / (x * x);
  return (
    (1 / 12 -
      x2 *
        (1 / 360 -
          x2 * (1 / 1260 - x2 * (1 / 1680 - x2 * (1 / 1188 - x2 * (691 / 360360 - x2 / 156)))))) /
    x
  );
}

/**
 * ln Γ(a + ½) − ln Γ(a) for a > 0. For a ≥ 10 it is evaluated from Stirling's series so that
 * the large, nearly equal log-gammas never get subtracted (keeps the t density accurate for
 * large degrees of freedom).
 */
export function logGammaHalfRatio(a: number): number {
  if (a < 10) return logGamma(a + 0.5) - logGamma(a);
  // (a)ln(a + ½) − (a − ½)ln a − ½ = ½ ln a + a·ln(1 + 1/(2a)) − ½
  return 0.5 * Math.log(a) + a * Math.log1p(0.5 / a) - 0.5 + stirlingRemainder(a + 0.5) - stirlingRemainder(a);
}

/** ln B(a, b) = ln Γ(a) + ln Γ(b) − ln Γ(a + b); the b = ½ case via {@link logGammaHalfRatio}. */
export function logBeta(a: number, b: number): number {
  if (b === 0.5) return LN_SQRT_PI - logGammaHalfRatio(a);
  if (a === 0.5) return LN_SQRT_PI - logGammaHalfRatio(b);
  return logGamma(a) + logGamma(b) - logGamma(a + b);
}

const TINY = 1e-300;

/**
 * Continued fraction for I_x(a, b) (the even/odd form of DLMF 8.17.22), evaluated by the
 * modified Lentz method (W. J. Lentz 1976; I. J. Thompson & A. R. Barnett 1986,
 * J. Comput. Phys. 64, 490–509). Converges fast for x < (a + 1)/(a + b + 2).
 */
function betaContinuedFraction(x: number, a: number, b: number): number {
  const qab = a + b;
  const qap = a + 1;
  const qam = a - 1;
  let c = 1;
  let d = 1 - (qab * x) / qap;
  if (Math.abs(d) < TINY) d = TINY;
  d = 1 / d;
  let h = d;
  for (let m = 1; m <= 100000; m++) {
    const m2 = 2 * m;
    let aa = (m * (b - m) * x) / ((qam + m2) * (a + m2));
    d = 1 + aa * d;
    if (Math.abs(d) < TINY) d = TINY;
    c = 1 + aa / c;
    if (Math.abs(c) < TINY) c = TINY;
    d = 1 / d;
    h *= d * c;
    aa = (-(a + m) * (qab + m) * x) / ((a + m2) * (qap + m2));
    d = 1 + aa * d;
    if (Math.abs(d) < TINY) d = TINY;
    c = 1 + aa / c;
    if (Math.abs(c) < TINY) c = TINY;
    d = 1 / d;
    const del = d * c;
    h *= del;
    if (Math.abs(del - 1) < 1e-16) return h;
  }
  return h; // not reached for the arguments used here
}

/**
 * Regularised incomplete beta I_x(a, b) for a, b > 0, with x and y = 1 − x (and optionally
 * their logarithms) supplied so
 * that callers can pass a y computed without cancellation. Returns [I_x(a, b), 1 − I_x(a, b)],
 * each computed directly (no subtraction from 1 for the small one).
 */
export function incompleteBetaPair(
  x: number,
  y: number,
  a: number,
  b: number,
  logX: number = Math.log(x),
  logY: number = Math.log(y),
): [number, number] {
  if (x <= 0) return [0, 1];
  if (y <= 0) return [1, 0];
  // ln of x^a y^b / B(a, b); callers may pass ln x and ln y computed with log1p, which matters
  // when a or b is large (an error of one ulp in x would be multiplied by a).
  const logFront = a * logX + b * logY - logBeta(a, b);
  if (x < (a + 1) / (a + b + 2)) {
    const v = (Math.exp(logFront) * betaContinuedFraction(x, a, b)) / a;
    return [v, 1 - v];
  }
  const w = (Math.exp(logFront) * betaContinuedFraction(y, b, a)) / b;
  return [1 - w, w];
}

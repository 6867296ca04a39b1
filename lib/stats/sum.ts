import { assertFiniteSample } from "./validate";

/**
 * Sum of `values` with Neumaier's compensated summation.
 *
 * Definition: the running sum s and a compensation c that collects the low-order bits lost
 * in each addition; the result is s + c. Unlike Kahan's original algorithm it stays exact
 * when an addend is larger in magnitude than the running sum.
 * Source: A. Neumaier (1974), "Rundungsfehleranalyse einiger Verfahren zur Summation
 * endlicher Summen", ZAMM 54, 39–51 (improving W. Kahan 1965, CACM 8(1), 40).
 *
 * Input: a non-empty array of finite numbers. Complexity O(n).
 * @throws RangeError for an empty array or a non-finite value (policy in `index.ts`).
 * @example sum([1e100, 1, -1e100]) // 1 (naive left-to-right summation gives 0)
 */
export function sum(values: readonly number[]): number {
  assertFiniteSample(values, "sum");
  return neumaierSum(values);
}

/**
 * Neumaier sum without input checks, for callers inside lib that have already validated.
 * Returns 0 for an empty array (the empty sum). Not re-exported from `index.ts`.
 */
export function neumaierSum(values: readonly number[]): number {
  let s = 0;
  let c = 0;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    const t = s + v;
    if (Math.abs(s) >= Math.abs(v)) {
      c += s - t + v;
    } else {
      c += v - t + s;
    }
    s = t;
  }
  return s + c;
}

export default sum;

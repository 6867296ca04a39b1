import { assertFiniteArray } from "./validate";

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
  assertFiniteArray(values, "sum");
  return neumaierSum(values);
}

/**
 * Neumaier's compensated running sum (the algorithm of {@link sum}), for a sum read as it grows.
 * Without input checks (callers inside lib have validated); empty, it is 0.
 */
export class RunningSum {
  private s = 0;
  private c = 0;
  add(v: number): void {
    const t = this.s + v;
    this.c += Math.abs(this.s) >= Math.abs(v) ? this.s - t + v : v - t + this.s;
    this.s = t;
  }
  value(): number {
    return this.s + this.c;
  }
}

/**
 * Neumaier sum without input checks, for callers inside lib that have already validated.
 * Returns 0 for an empty array (the empty sum). Not re-exported from `index.ts`.
 */
export function neumaierSum(values: readonly number[]): number {
  const total = new RunningSum();
  for (let i = 0; i < values.length; i++) total.add(values[i]);
  return total.value();
}

export default sum;

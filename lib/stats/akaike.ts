import { assertFiniteArray } from "./validate";

/**
 * Akaike weights of competing models from their information criteria (AIC or AICc):
 * w_i = exp(−Δ_i/2) / Σ_k exp(−Δ_k/2), Δ_i = c_i − min_k c_k, read as the weight of evidence
 * for model i among those compared. Subtracting the minimum keeps exp() from underflowing.
 * Source: K. P. Burnham and D. R. Anderson (2002), *Model Selection and Multimodel Inference*,
 * 2nd ed., Springer, §2.9 (from memory); used to combine exponential-smoothing forecasts by
 * S. Kolassa (2011), "Combining exponential smoothing forecasts using Akaike weights", IJF 27(2),
 * 238–251 (pages from memory).
 *
 * Input: a non-empty array of finite criteria (the caller leaves out models without one).
 * The weights are ≥ 0 and sum to 1; equal criteria get equal weights.
 * @throws RangeError for an empty array or a non-finite value (policy in `index.ts`).
 * @example akaikeWeights([100, 102]) // [0.731…, 0.268…]: 1/(1 + e^−1) and e^−1/(1 + e^−1)
 */
export function akaikeWeights(criteria: readonly number[]): number[] {
  assertFiniteArray(criteria, "akaikeWeights");
  const best = Math.min(...criteria);
  const raw = criteria.map((c) => Math.exp(-(c - best) / 2));
  const total = raw.reduce((a, w) => a + w, 0);
  return raw.map((w) => w / total);
}

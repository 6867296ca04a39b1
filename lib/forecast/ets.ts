/**
 * The exponential-smoothing family: where each part lives. Start here.
 *
 * Pure TypeScript: no framework, database or validation-library imports.
 *
 * Source for every recursion and variance: Hyndman, R. J., Koehler, A. B., Ord, J. K. &
 * Snyder, R. D. (2008) "Forecasting with Exponential Smoothing: the state space approach",
 * Springer (tables 2.1 and 6.1, ch. 5–7), and Hyndman & Athanasopoulos, "Forecasting:
 * Principles and Practice" (FPP), ch. 7–8. The classical component forms are Brown (1959) /
 * Holt (1957) / Winters (1960) / Gardner & McKenzie (1985) (damped trend).
 *
 * Additive-error members, fitted by least squares (their likelihood); the named methods ses,
 * holt, damped-holt, holt-winters-additive and holt-winters-multiplicative (ETS(A,A,M): same
 * point recursions as M,A,M, least squares being the A,A,M likelihood):
 *   ets/model.ts           the member (trend N/A/Ad, season N/A/M), parameter bounds, input checks
 *   ets/recursions.ts      the loops: one pass over the series, and the derivative passes
 *   ets/initial-states.ts  initial states for given parameters (least squares), start values
 *   ets/joint-search.ts    start candidates and the joint Levenberg–Marquardt search
 *   ets/linear-algebra.ts  Cholesky solve, damped normal equations
 *   ets/least-squares.ts   fitEts: the estimation, from input checks to the fitted states
 *   ets/forecast.ts        etsForecast: means, closed-form and simulated intervals
 *   ets/simulate.ts        simulated paths of A,A,M
 *   ets/method.ts          etsMethod: the five named methods from one factory
 * The whole family in state-space form (errors A or M) with the member chosen by AICc, the
 * `ets` method (lib/forecast/methods/ets.ts):
 *   ets/state-space.ts     recursions on one state object, likelihood, sample paths
 *   ets/estimate.ts        maximum likelihood of the M-error members
 *   ets/family.ts          the candidate members and the AICc choice
 *   ets/distribution.ts    forecast distributions by class
 *
 * Every part works on the same records: the smoothing parameters {alpha, beta, gamma, phi}
 * (`Smoothing`) and the states {level, trend, ring, k} (`EtsState`), both in ets/state-space.ts.
 */
export * from "./ets/model";
export { fitEts, type EtsFitResult } from "./ets/least-squares";
export { heuristicStates } from "./ets/initial-states";
export { etsForecast } from "./ets/forecast";
export { simulateAam, SIMULATION_PATHS, SIMULATION_RNG_START } from "./ets/simulate";
export { etsMethod, toFit } from "./ets/method";

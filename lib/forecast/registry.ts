/**
 * Every baseline method, in the order of METHOD_IDS (lib/forecast/types.ts).
 * The order matters: automatic selection breaks ties in favour of the method listed first.
 */
import { METHOD_IDS, type Method, type MethodId } from "./types";
import naive from "./methods/naive";
import seasonalNaive from "./methods/seasonal-naive";
import drift from "./methods/drift";
import movingAverage from "./methods/moving-average";
import weightedMovingAverage from "./methods/weighted-moving-average";
import ses from "./methods/ses";
import holt from "./methods/holt";
import dampedHolt from "./methods/damped-holt";
import holtWintersAdditive from "./methods/holt-winters-additive";
import holtWintersMultiplicative from "./methods/holt-winters-multiplicative";
import ets from "./methods/ets";
import etsWeighted from "./methods/ets-weighted";
import theta from "./methods/theta";
import linearTrend from "./methods/linear-trend";
import regression from "./methods/regression";
import arima from "./methods/arima";
import bass from "./methods/bass";

/** All registered methods, in METHOD_IDS order. */
export const METHODS: readonly Method[] = ([
  naive,
  seasonalNaive,
  drift,
  movingAverage,
  weightedMovingAverage,
  ses,
  holt,
  dampedHolt,
  holtWintersAdditive,
  holtWintersMultiplicative,
  ets,
  etsWeighted,
  theta,
  linearTrend,
  regression,
  arima,
  bass,
] as Method[]).sort(
  (a, b) => METHOD_IDS.indexOf(a.id) - METHOD_IDS.indexOf(b.id),
);

/** Whether a string is a known method id. */
export function isMethodId(id: string): id is MethodId {
  return (METHOD_IDS as readonly string[]).includes(id);
}

/**
 * The method with this id.
 * @throws Error naming the id and the registered ids when it is unknown or not registered.
 */
export function getMethod(id: string): Method {
  const m = METHODS.find((x) => x.id === id);
  if (!m) {
    throw new Error(`unknown method '${id}' (methods: ${METHODS.map((x) => x.id).join(", ")})`);
  }
  return m;
}

/**
 * Automatic method selection by rolling-origin evaluation scored with MASE.
 *
 * Rolling-origin evaluation (Tashman, L. J. (2000). Out-of-sample tests of forecasting
 * accuracy: an analysis and review. *International Journal of Forecasting* 16(4), 437–450):
 * the series is cut at several forecast origins near its end; at each origin every candidate
 * forecasts the next h values (h = the requested horizon, shortened only for short series)
 * from the data before the origin alone. Tashman distinguishes re-estimating the model at
 * every new origin ("recalibration") from only updating it with the new data; both are
 * offered here:
 *   - "full": every parameter and initial state is re-estimated at every origin;
 *   - "update" (default): they are estimated once, at the earliest origin, and the model is
 *     carried forward with them held fixed. Far cheaper, and still out of sample: no
 *     parameter ever sees a value it is scored on.
 * Errors are scaled as in MASE (Hyndman, R. J. & Koehler, A. B. (2006). Another look at
 * measures of forecast accuracy. *IJF* 22(4), 679–688): by the in-sample mean absolute error
 * of the naive forecast (seasonal naive when m > 1) on the training part at that origin. A
 * candidate's score is the mean of its MASE over the origins. See also Hyndman &
 * Athanasopoulos, *Forecasting: Principles and Practice* (3rd ed.), §5.10 "Time series
 * cross-validation".
 *
 * Optional combination: the equal-weight mean of the best k candidates' forecasts (Clemen,
 * R. T. (1989). Combining forecasts: a review and annotated bibliography. *IJF* 5(4),
 * 559–583; simple combinations did well in the M3 and M4 competitions, Makridakis & Hibon
 * 2000, Makridakis, Spiliotis & Assimakopoulos 2020). The combination is scored on the same
 * origins from the candidates' stored forecasts (no extra fits) and is reported next to them.
 * It is off by default: on the benchmark (bench/forecast-bench.ts) it did not beat choosing
 * the single best candidate consistently.
 */
import { maseDenominator } from "./accuracy";
import type { Fit, FitInput, FutureX, Method, MethodId } from "./types";

/** Default number of forecast origins. */
export const DEFAULT_ORIGINS = 3;
/** Default refitting at the origins (see SelectOptions.refit). */
export const DEFAULT_REFIT: "full" | "update" = "update";
/**
 * Default distance between origins. Two rather than one: the test windows overlap less, and on
 * the benchmark (3 origins) spacing 2 scored better than spacing 1 in repeated runs; the gap
 * was small (geometric-mean MASE ratio to ets() 0.84–0.86 against 0.87–0.89).
 */
export const DEFAULT_STEP = 2;
/** Default number of candidates averaged by the combination. */
export const DEFAULT_COMBINE = 3;
/** Relative difference under which two scores count as tied (the earlier method in the list wins). */
export const TIE_TOLERANCE = 1e-9;

/** Input to {@link rollingOrigin} and {@link selectMethod}. */
export interface EvaluationInput {
  /** Finite observations (the series policy has already been applied). */
  readonly y: readonly number[];
  /** Season length m used by the methods and by the MASE scale. */
  readonly season: number;
  /** Largest horizon evaluated. */
  readonly horizon: number;
  /** Explanatory columns aligned with y (for `regression`). */
  readonly x?: readonly (readonly number[])[];
  readonly xNames?: readonly string[];
}

/** Options for {@link selectMethod}. */
export interface SelectOptions {
  /** Number of forecast origins (default {@link DEFAULT_ORIGINS}). */
  readonly origins?: number;
  /** Distance between consecutive origins in observations (default {@link DEFAULT_STEP}). */
  readonly step?: number;
  /**
   * "full": re-estimate every parameter at every origin (rolling origin with recalibration);
   * "update": estimate once at the earliest origin and carry the model forward with its
   * parameters and initial states held fixed at later origins (rolling origin with updating
   * but without recalibration, Tashman 2000). Default {@link DEFAULT_REFIT}.
   */
  readonly refit?: "full" | "update";
  /**
   * "best": the candidate with the lowest score; "combine": the equal-weight combination of
   * the best `combine` candidates when its score beats the best single one (default "best").
   */
  readonly strategy?: "best" | "combine";
  /** Number of candidates in the combination (default {@link DEFAULT_COMBINE}). */
  readonly combine?: number;
}

/** One candidate's result. */
export interface CandidateScore {
  readonly method: MethodId;
  /** Mean MASE over the origins; null when the method could not be evaluated. */
  readonly mase: number | null;
  /** Number of origins that were scored. */
  readonly origins: number;
  /** Why the method has no score (it threw, or the series is too short for it). */
  readonly error?: string;
}

/** What {@link selectMethod} returns. */
export interface Selection {
  /** The chosen method, or the members of the chosen combination (best first). */
  readonly chosen: readonly MethodId[];
  /** Score of the choice (the combination's own score when a combination is chosen). */
  readonly mase: number | null;
  /** Every candidate, in the order the methods were given (callers sort for display). */
  readonly candidates: readonly CandidateScore[];
  /** Score of the combination of the best candidates, when it was computed. */
  readonly combination?: { readonly methods: readonly MethodId[]; readonly mase: number };
  /** Origins used (training lengths), and the horizon evaluated at each. */
  readonly originLengths: readonly number[];
  readonly evaluatedHorizon: number;
  readonly notes: readonly string[];
  /**
   * Per scored candidate, its parameters and initial states at the forecast origins (the
   * earliest origin's with refit "update", the latest origin's with "full"), in the form of a
   * `fixed` record: a warm start (FitInput.start) for the fit on the whole series, whose
   * initial states refer to the same first observation.
   */
  readonly estimates?: Readonly<Partial<Record<MethodId, Readonly<Record<string, number>>>>>;
}

/**
 * Forecast origins for a series of length n: up to `count` training lengths ending h steps
 * (clipped) before the end, `step` apart, longest first; each at least `minTrain`. The
 * evaluated horizon shrinks when the series is too short for h (never below 1).
 */
export function originPlan(
  n: number,
  horizon: number,
  count: number,
  minTrain: number,
  step = 1,
): { lengths: number[]; horizon: number } {
  const hEval = Math.max(1, Math.min(horizon, n - minTrain - (count - 1) * step));
  const lengths: number[] = [];
  for (let k = 0; k < count; k++) {
    const t = n - hEval - k * step;
    if (t < minTrain) break;
    lengths.push(t);
  }
  return { lengths, horizon: hEval };
}

/** Per-origin forecasts of one candidate (kept so that combinations can be scored). */
interface OriginForecasts {
  readonly means: (readonly number[] | null)[];
  readonly error?: string;
  /** Parameters and initial states of the last fit (see {@link frozenParameters}). */
  readonly estimates?: Record<string, number>;
}

function sliceX(x: readonly (readonly number[])[] | undefined, from: number, to: number) {
  return x?.map((c) => c.slice(from, to));
}

/**
 * Parameters and initial states of a fit as a `fixed` record, so that the same model can be
 * run over a longer stretch of the series without re-estimation: the fit's parameters plus,
 * where the fit's state has them, the initial states l0, b0 and s1…sm.
 */
export function frozenParameters(fit: Fit): Record<string, number> {
  const fixed: Record<string, number> = { ...fit.parameters };
  const st = fit.state;
  if (typeof st.l0 === "number") fixed.l0 = st.l0;
  if (typeof st.b0 === "number") fixed.b0 = st.b0;
  if (typeof st.model === "number") fixed.model = st.model; // the ETS family's member (lib/forecast/ets/family.ts)
  const s0 = st.initialSeason;
  if (Array.isArray(s0)) s0.forEach((v: number, i: number) => (fixed[`s${i + 1}`] = v));
  return fixed;
}

function runOrigins(
  method: Method,
  input: EvaluationInput,
  lengths: readonly number[],
  h: number,
  refit: "full" | "update",
): OriginForecasts {
  // Shortest training length first, so that "update" estimates on the earliest origin only.
  const order = lengths.map((t, k) => ({ t, k })).sort((a, b) => a.t - b.t);
  const out = new Array<readonly number[] | null>(lengths.length).fill(null);
  let frozen: Record<string, number> | undefined;
  let frozenWorks = refit === "update";
  let last: Fit | undefined;
  for (const { t, k } of order) {
    const y = input.y.slice(0, t);
    if (y.length < method.minLength(input.season) || !method.applicable(y, input.season, input.x !== undefined)) continue;
    try {
      const base: FitInput = { y, season: input.season, x: sliceX(input.x, 0, t), xNames: input.xNames };
      let fit: Fit | undefined;
      if (frozen && frozenWorks) {
        try {
          fit = method.fit({ ...base, fixed: frozen });
        } catch {
          frozenWorks = false; // the method does not take its own parameters back; refit fully from now on
        }
      }
      if (!fit) {
        fit = method.fit(base);
        if (frozenWorks && !frozen) frozen = frozenParameters(fit);
      }
      last = fit;
      const futureX: FutureX | undefined = sliceX(input.x, t, t + h);
      const fc = method.forecast(fit, h, [], futureX); // means only: no interval levels
      if (fc.mean.length < h || fc.mean.slice(0, h).some((v) => !Number.isFinite(v))) {
        return { means: out, error: `non-finite forecast at origin ${t}` };
      }
      out[k] = fc.mean;
    } catch (e) {
      return { means: out, error: e instanceof Error ? e.message : String(e) };
    }
  }
  return { means: out, ...(last ? { estimates: frozen ?? frozenParameters(last) } : {}) };
}

function scoreMeans(
  input: EvaluationInput,
  lengths: readonly number[],
  h: number,
  means: readonly (readonly number[] | null)[],
): { mase: number | null; origins: number } {
  let total = 0;
  let count = 0;
  lengths.forEach((t, k) => {
    const f = means[k];
    if (!f) return;
    const scale = maseDenominator(input.y.slice(0, t), input.season);
    if (!(scale > 0)) return;
    let s = 0;
    for (let j = 0; j < h; j++) s += Math.abs(input.y[t + j] - f[j]);
    total += s / h / scale;
    count += 1;
  });
  return { mase: count > 0 ? total / count : null, origins: count };
}

/**
 * Rolling-origin MASE of one method (see the module comment). Refits at every origin.
 *
 * @returns the mean MASE over the scored origins (null when none could be scored) and the
 *   error message when the method threw; never throws for a method's failure.
 */
export function rollingOrigin(
  method: Method,
  input: EvaluationInput,
  origins = DEFAULT_ORIGINS,
  step = DEFAULT_STEP,
  refit: "full" | "update" = DEFAULT_REFIT,
): CandidateScore {
  const minTrain = Math.max(method.minLength(input.season), input.season + 1, 2);
  const plan = originPlan(input.y.length, input.horizon, origins, minTrain, step);
  if (plan.lengths.length === 0) {
    return { method: method.id, mase: null, origins: 0, error: `too few observations to evaluate ${method.id} out of sample` };
  }
  const run = runOrigins(method, input, plan.lengths, plan.horizon, refit);
  if (run.error) return { method: method.id, mase: null, origins: 0, error: run.error };
  const sc = scoreMeans(input, plan.lengths, plan.horizon, run.means);
  return { method: method.id, mase: sc.mase, origins: sc.origins, ...(sc.mase === null ? { error: "no origin could be scored" } : {}) };
}

/**
 * Scores every candidate by rolling-origin MASE and chooses one (or a combination).
 *
 * All candidates share one origin plan, so their scores are comparable: the origins are set by
 * the candidate needing the most data among those that apply. Ties (relative difference under
 * {@link TIE_TOLERANCE}) go to the method listed first. A candidate that throws is reported with
 * its error message and no score; it never stops the others.
 *
 * @throws Error only when `methods` is empty.
 * Empty/NaN policy: `input.y` must already be finite (see lib/forecast/series.ts).
 */
export function selectMethod(methods: readonly Method[], input: EvaluationInput, options: SelectOptions = {}): Selection {
  if (methods.length === 0) throw new Error("no candidate methods to select from");
  const count = Math.max(1, Math.floor(options.origins ?? DEFAULT_ORIGINS));
  const n = input.y.length;
  const notes: string[] = [];

  // Common plan: the largest minimum training length among methods that can be evaluated at all.
  const minTrains = methods.map((m) => Math.max(m.minLength(input.season), input.season + 1, 2));
  const feasible = minTrains.filter((t) => t + 1 <= n);
  const minTrain = feasible.length > 0 ? Math.max(...feasible) : n;
  const step = Math.max(1, Math.floor(options.step ?? DEFAULT_STEP));
  const plan = originPlan(n, input.horizon, count, minTrain, step);
  if (plan.horizon < input.horizon && plan.lengths.length > 0) {
    notes.push(`the series is short: candidates were compared on ${plan.horizon}-step forecasts instead of ${input.horizon}`);
  }

  const runs = new Map<MethodId, OriginForecasts>();
  const estimates: Partial<Record<MethodId, Record<string, number>>> = {};
  const candidates: CandidateScore[] = methods.map((m) => {
    if (plan.lengths.length === 0 || m.minLength(input.season) > plan.lengths[plan.lengths.length - 1]) {
      return { method: m.id, mase: null, origins: 0, error: `too few observations to evaluate ${m.id} out of sample` };
    }
    const run = runOrigins(m, input, plan.lengths, plan.horizon, options.refit ?? DEFAULT_REFIT);
    if (run.error) return { method: m.id, mase: null, origins: 0, error: run.error };
    runs.set(m.id, run);
    if (run.estimates) estimates[m.id] = run.estimates;
    const sc = scoreMeans(input, plan.lengths, plan.horizon, run.means);
    if (sc.mase === null) return { method: m.id, mase: null, origins: 0, error: "no origin could be scored" };
    if (sc.origins < plan.lengths.length) {
      // Scores over different origins are not comparable; such a candidate is not ranked.
      return { method: m.id, mase: null, origins: sc.origins, error: `could be scored at only ${sc.origins} of ${plan.lengths.length} origins` };
    }
    return { method: m.id, mase: sc.mase, origins: sc.origins };
  });

  const scored = candidates
    .map((c, i) => ({ c, i }))
    .filter((e) => e.c.mase !== null)
    .sort((a, b) => {
      const d = a.c.mase! - b.c.mase!;
      return Math.abs(d) <= TIE_TOLERANCE * Math.max(Math.abs(a.c.mase!), Math.abs(b.c.mase!)) ? a.i - b.i : d;
    });

  if (scored.length === 0) {
    return { chosen: [], mase: null, candidates, originLengths: plan.lengths, evaluatedHorizon: plan.horizon, notes };
  }
  const best = scored[0].c;
  let chosen: MethodId[] = [best.method];
  let mase: number | null = best.mase;
  let combination: Selection["combination"];

  const k = Math.max(2, Math.floor(options.combine ?? DEFAULT_COMBINE));
  if (options.strategy === "combine" && scored.length >= 2) {
    const members = scored.slice(0, Math.min(k, scored.length)).map((e) => e.c.method);
    const avg = plan.lengths.map((_, o) => {
      const out = new Array<number>(plan.horizon).fill(0);
      for (const id of members) {
        const f = runs.get(id)!.means[o]!;
        for (let j = 0; j < plan.horizon; j++) out[j] += f[j] / members.length;
      }
      return out;
    });
    const sc = scoreMeans(input, plan.lengths, plan.horizon, avg);
    if (sc.mase !== null) {
      combination = { methods: members, mase: sc.mase };
      if (sc.mase < best.mase! * (1 - TIE_TOLERANCE)) {
        chosen = members;
        mase = sc.mase;
      }
    }
  }
  return { chosen, mase, candidates, combination, originLengths: plan.lengths, evaluatedHorizon: plan.horizon, notes, estimates };
}

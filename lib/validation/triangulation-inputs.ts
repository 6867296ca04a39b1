/**
 * zod 4 schemas of what clients send for triangulation (issue 4): baselines on questions,
 * blend weight rules, outcomes. Used by the route table (lib/http/routes.ts) and by pages'
 * server actions; the services in lib/panels and lib/triangulation take their parsed types.
 */
import { z } from "zod";
import { METHOD_IDS } from "@/lib/forecast/types";
import { MAX_HISTORY_ROWS, historyRowsMessage } from "./limits";
import { usableNumber as finite } from "./inputs";

const text = (max: number) => z.string().trim().min(1, "must not be empty").max(max, `at most ${max} characters`);

/** Largest CSV text accepted (characters). */
export const MAX_CSV_CHARS = 1_000_000;

export const BASELINE_METHODS = ["auto", ...METHOD_IDS] as const;
/** What a baseline answers, in the history's periods (lib/triangulation/baselines.ts). */
export const BASELINE_QUANTITIES = ["value", "total", "average"] as const;
/** What one history row is. */
export const HISTORY_PERIODS = ["month", "quarter", "year", "week", "day", "other"] as const;
export const WEIGHT_RULES = ["equal", "inverse-mse", "organiser"] as const;
export type PanelWeightRule = (typeof WEIGHT_RULES)[number];

/** Most analogous products one launch baseline takes. */
export const MAX_ANALOGUES = 5;

/**
 * A launch baseline (docs/methods.md §19): adoptions per period since launch of 1–5 analogous
 * products, and the new product's market potential either from a question of the same panel
 * (its corrected panel figure and 80% range) or as a low / median / high (P10 / P50 / P90).
 */
export const launchInput = z.object({
  analogues: z
    .array(
      z.object({
        name: text(100).describe("The analogous product"),
        values: z
          .array(finite.min(0, "adoptions cannot be negative"))
          .min(5, "give at least 5 periods of adoptions (the Bass fit has three parameters)")
          .max(MAX_HISTORY_ROWS, `at most ${MAX_HISTORY_ROWS} periods`)
          .describe("Adoptions per period since its launch, first period first"),
      }),
    )
    .min(1, "give at least one analogous product")
    .max(MAX_ANALOGUES, `at most ${MAX_ANALOGUES} analogous products`),
  market: z
    .union([
      z.object({ questionId: z.string().trim().min(1).max(100).describe("A question of the same panel that asks for the market potential") }).strict(),
      z
        .object({
          low: finite.positive("must be above 0").describe("P10 of the market potential"),
          median: finite.positive("must be above 0"),
          high: finite.positive("must be above 0").describe("P90"),
        })
        .strict()
        .refine((m) => m.low < m.median && m.median < m.high, { message: "needs low < median < high", path: ["median"] }),
    ])
    .describe("The new product's market potential m: from a panel question, or low / median / high"),
  note: text(500).describe("Why these analogues: similar adoption drivers (price, channel, who adopts and why)"),
});
export type LaunchInput = z.infer<typeof launchInput>;

/**
 * A baseline for a question: the history as CSV text (`csv`, with `valueColumn` naming the
 * series and other numeric columns as explanatory columns) or as pasted values (`values`),
 * exactly one of the two. `futureValues` gives each explanatory column's values for steps
 * 1…horizon (else the CSV's trailing rows with an empty value column are used). `analogue`
 * marks the history as an analogous product's, scaled by `scaleFactor` (with a note saying
 * why that factor). `horizon` is the number of steps from the last observation to the
 * question's target period (default: the number of future rows, else 1).
 */
export const baselineInput = z
  .object({
    csv: z
      .string()
      .max(MAX_CSV_CHARS, `at most ${MAX_CSV_CHARS} characters`)
      .superRefine((csv, ctx) => {
        // Counted before any parsing: the rows' number bounds the fit's time (lib/validation/limits.ts).
        const refusal = historyRowsMessage(csv);
        if (refusal) ctx.addIssue({ code: "custom", message: refusal });
      })
      .optional()
      .describe(`CSV text with a header row (at most ${MAX_HISTORY_ROWS} data rows)`),
    values: z
      .array(finite)
      .min(1, "give at least one value")
      .max(MAX_HISTORY_ROWS, `at most ${MAX_HISTORY_ROWS} values (far longer than any monthly or quarterly business history)`)
      .optional()
      .describe("Pasted values, oldest first"),
    valueColumn: text(100).default("value").describe("CSV column holding the series"),
    futureValues: z
      .record(z.string().min(1).max(100), z.array(finite).min(1).max(1000))
      .optional()
      .describe("Explanatory columns' values for steps 1…horizon, by column name"),
    analogue: z
      .object({
        scaleFactor: finite.positive("must be above 0").max(1e6),
        note: text(500).describe("Which product the history is from and why this factor"),
      })
      .optional()
      .describe("The history is an analogous product's, scaled by scaleFactor"),
    season: z.number().int("must be a whole number").min(1, "at least 1").max(52, "at most 52").default(1).describe("Season length (4 quarterly, 12 monthly)"),
    method: z.enum(BASELINE_METHODS).default("auto").describe("auto (ETS weighted by AICc and Theta, averaged) or a method id"),
    horizon: z.number().int("must be a whole number").min(1, "at least 1").max(1000, "at most 1000").optional().describe("Steps to the target period (value), or the last period b of a total or average over periods firstPeriod..b"),
    firstPeriod: z
      .number()
      .int("must be a whole number")
      .min(1, "at least 1")
      .max(1000, "at most 1000")
      .default(1)
      .describe("First period a of a total or average over periods a..horizon after the last history row (after launch for a launch baseline); default 1, the next period. Only with quantity total or average"),
    quantity: z
      .enum(BASELINE_QUANTITIES)
      .default("value")
      .describe("What the question asks for: value (in period `horizon`), total or average (over periods `firstPeriod`..`horizon`; firstPeriod defaults to 1, the next `horizon` periods)"),
    period: z.enum(HISTORY_PERIODS).default("other").describe("What one history row is: month, quarter, year, week, day or other"),
    launch: launchInput.optional().describe("A launch baseline instead of a history: Bass diffusion fitted to analogous products, market potential from the panel"),
  })
  .superRefine((b, ctx) => {
    const given = [b.csv, b.values, b.launch].filter((v) => v !== undefined).length;
    if (given !== 1) {
      ctx.addIssue({ code: "custom", path: ["csv"], message: "give exactly one of csv, values or launch" });
    }
    if (b.launch !== undefined) {
      if (b.method !== "auto" && b.method !== "bass") ctx.addIssue({ code: "custom", path: ["method"], message: "a launch baseline uses the Bass method (give auto or bass)" });
      if (b.analogue !== undefined) ctx.addIssue({ code: "custom", path: ["analogue"], message: "a launch baseline names its analogues under launch.analogues; leave out analogue" });
      if (b.futureValues !== undefined) ctx.addIssue({ code: "custom", path: ["futureValues"], message: "a launch baseline has no explanatory columns" });
    }
    if (b.firstPeriod !== 1 && b.quantity === "value") {
      ctx.addIssue({ code: "custom", path: ["firstPeriod"], message: "a first period applies to a total or average; for the value in one period give only the horizon" });
    }
    if (b.horizon !== undefined && b.firstPeriod > b.horizon) {
      ctx.addIssue({ code: "custom", path: ["firstPeriod"], message: `the first period must not be after the last one (the horizon, ${b.horizon})` });
    }
    if (b.values !== undefined && b.futureValues !== undefined) {
      ctx.addIssue({ code: "custom", path: ["futureValues"], message: "pasted values have no explanatory columns; use csv" });
    }
  });
export type BaselineInput = z.infer<typeof baselineInput>;

/** What the panel leg of the blend is on a panel with calibration questions (lib/triangulation/calibration.ts). */
export const PANEL_LEGS = ["equal", "performance"] as const;
export type PanelLegChoice = (typeof PANEL_LEGS)[number];

/** The blend weight rule of a panel. `panelWeight` (0–1) is required for the organiser rule. */
export const panelBlendRuleInput = z
  .object({
    rule: z.enum(WEIGHT_RULES).describe("equal (50/50), inverse-mse (Bates & Granger, from past outcomes) or organiser"),
    panelWeight: z.number().min(0, "at least 0").max(1, "at most 1").optional().describe("The panel's weight (organiser rule)"),
    panelLeg: z
      .enum(PANEL_LEGS, { error: 'must be "equal" or "performance"' })
      .optional()
      .describe(
        "The panel leg of three-point shared questions: equal (the answers as they are, the default) or performance (Cooke's performance-weighted pool from the panel's calibration questions, docs/methods.md §21). Omitted: unchanged.",
      ),
  })
  .superRefine((b, ctx) => {
    if (b.rule === "organiser" && b.panelWeight === undefined) ctx.addIssue({ code: "custom", path: ["panelWeight"], message: "the organiser rule needs a panel weight between 0 and 1" });
    if (b.rule !== "organiser" && b.panelWeight !== undefined) ctx.addIssue({ code: "custom", path: ["panelWeight"], message: "a panel weight is given only with the organiser rule" });
  });
export type PanelBlendRuleInput = z.infer<typeof panelBlendRuleInput>;

/** A question's blend weight rule; `panel` = use the panel's rule. */
export const questionBlendRuleInput = z
  .object({
    rule: z.enum(["panel", ...WEIGHT_RULES]).describe("panel (the panel's rule), equal, inverse-mse or organiser"),
    panelWeight: z.number().min(0, "at least 0").max(1, "at most 1").optional(),
  })
  .superRefine((b, ctx) => {
    if (b.rule === "organiser" && b.panelWeight === undefined) ctx.addIssue({ code: "custom", path: ["panelWeight"], message: "the organiser rule needs a panel weight between 0 and 1" });
    if (b.rule !== "organiser" && b.panelWeight !== undefined) ctx.addIssue({ code: "custom", path: ["panelWeight"], message: "a panel weight is given only with the organiser rule" });
  });
export type QuestionBlendRuleInput = z.infer<typeof questionBlendRuleInput>;

const partOutcomes = z
  .array(z.object({ pseudonym: text(60), outcomeValue: finite }))
  .max(500)
  .default([])
  .describe("Sum-of-parts questions: each part's outcome, by the panelist's pseudonym (feeds their track record)");

/** Recording a question's outcome: its outcome value (once). */
export const outcomeInput = z.object({
  outcomeValue: finite.describe("The outcome value, in the question's unit"),
  note: z.string().trim().max(2000).default("").describe("Where the outcome value comes from"),
  parts: partOutcomes,
});
export type OutcomeInput = z.infer<typeof outcomeInput>;

/** Correcting a recorded outcome value (audited, with the reason). */
export const outcomeCorrection = z.object({
  outcomeValue: finite.describe("The corrected outcome value"),
  reason: text(500).describe("Why the recorded value was wrong; kept in the audit log"),
  parts: partOutcomes.optional(),
});
export type OutcomeCorrection = z.infer<typeof outcomeCorrection>;

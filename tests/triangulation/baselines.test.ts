/**
 * Reading and fitting a question's baseline (lib/triangulation/baselines.ts `analyseBaseline`): the
 * target period's forecast with explanatory columns and their target-period values (against R's
 * lm() + predict.lm), an analogous product's history scaled by a stated factor (against R's
 * forecast::naive on the scaled series), and errors that name the row, column or option.
 * Pure: `analyseBaseline` touches no database.
 */
import { describe, expect, it } from "vitest";
import { analyseBaseline } from "../../lib/triangulation/baselines";
import { InvalidInputError } from "../../lib/errors";
import { baselineInput, panelBlendRuleInput } from "../../lib/validation/triangulation-inputs";
import { expectClose, runR, rVector } from "../stats/rscript";

const parse = (body: unknown) => baselineInput.parse(body);

/** Invented monthly sales with the price of the month (explanatory column). */
const SALES = [410, 432, 398, 455, 470, 441, 489, 502, 468, 515, 530, 498];
const PRICE = [9.9, 9.5, 10.2, 9.4, 9.1, 9.8, 8.9, 8.7, 9.5, 8.6, 8.4, 9.2];

async function errorOf(body: unknown): Promise<InvalidInputError> {
  try {
    await analyseBaseline(parse(body));
  } catch (err) {
    if (err instanceof InvalidInputError) return err;
    throw err;
  }
  throw new Error("no error");
}

describe("analyseBaseline", () => {
  it("regression on an explanatory column with its target-period values given separately equals R's lm() + predict.lm", async () => {
    const csv = ["month,price,value", ...SALES.map((v, i) => `2025-${String(i + 1).padStart(2, "0")},${PRICE[i]},${v}`)].join("\n");
    const a = await analyseBaseline(parse({ csv, method: "regression", futureValues: { price: [8.8, 8.5] } }));
    const [[fit, l80, u80, l95, u95]] = runR(`
      d <- data.frame(y = ${rVector(SALES)}, price = ${rVector(PRICE)})
      f <- lm(y ~ price, data = d)
      p80 <- predict(f, data.frame(price = 8.5), interval = "prediction", level = 0.8)
      p95 <- predict(f, data.frame(price = 8.5), interval = "prediction", level = 0.95)
      out(c(p80[1, "fit"], p80[1, "lwr"], p80[1, "upr"], p95[1, "lwr"], p95[1, "upr"]))
    `);
    expect(a.horizon).toBe(2); // default: the number of target-period values given
    expect(a.preview.explanatoryColumns).toEqual(["price"]);
    expect(a.preview.ignoredColumns).toEqual(["month"]);
    expect(a.preview.futureRows).toEqual([{ step: 1, x: { price: 8.8 } }, { step: 2, x: { price: 8.5 } }]);
    expectClose([a.target.mean!, a.target.lower80!, a.target.upper80!, a.target.lower95!, a.target.upper95!], [fit, l80, u80, l95, u95], 1e-10, "regression vs R");
  });

  it("the CSV's own future rows give the explanatory values when none are given separately", async () => {
    const csv = ["price,value", ...SALES.map((v, i) => `${PRICE[i]},${v}`), "8.8,", "8.5,"].join("\n");
    const a = await analyseBaseline(parse({ csv, method: "regression" }));
    expect(a.horizon).toBe(2);
    expect(a.preview.rows).toHaveLength(12);
    expect(a.preview.futureRows.map((r) => r.x.price)).toEqual([8.8, 8.5]);
  });

  it("an analogous product's history × 1.15 forecasts as R's naive() on the scaled series", async () => {
    const a = await analyseBaseline(parse({ values: SALES, method: "naive", horizon: 2, analogue: { scaleFactor: 1.15, note: "the older model, 15% smaller market" } }));
    const [[m, l80, u80, l95, u95]] = runR(`
      suppressMessages(library(forecast))
      f <- naive(${rVector(SALES)} * 1.15, h = 2, level = c(80, 95))
      out(c(f$mean[2], f$lower[2, 1], f$upper[2, 1], f$lower[2, 2], f$upper[2, 2]))
    `);
    expectClose([a.target.mean!, a.target.lower80!, a.target.upper80!, a.target.lower95!, a.target.upper95!], [m, l80, u80, l95, u95], 1e-12, "scaled naive vs R");
    expect(a.preview.rows[0]).toEqual({ row: 1, value: 410, scaled: 410 * 1.15, x: {} });
    expect(a.result.notes.join(" ")).toMatch(/multiplied by 1.15 before fitting: the older model/);
  });

  it("errors name the CSV row and column, the value column, the explanatory column or the option", async () => {
    const bad = await errorOf({ csv: "value\n1\n2\nabc\n4" });
    expect(bad.errors).toEqual([{ field: "csv", row: 4, column: "value", message: "row 4, column 'value': 'abc' is not a number" }]);
    expect((await errorOf({ csv: "units\n1\n2", valueColumn: "sales" })).errors[0].field).toBe("valueColumn");
    expect((await errorOf({ csv: "price,value\n1,2\n2,3\n3,5", futureValues: { cost: [1] } })).errors.map((e) => e.field)).toEqual(["futureValues.cost", "futureValues.price"]);
    expect((await errorOf({ values: [1, 2, 3, 4, 5], method: "seasonal-naive", season: 4 })).errors[0].field).toBe("season");
    expect((await errorOf({ values: [5] })).errors[0].field).toBe("values");
    expect((await errorOf({ csv: "value\n" })).errors[0]).toMatchObject({ field: "csv", message: "the history has no data rows" });
  });

  it("the request schema wants exactly one of csv and values, and an organiser weight only with its rule", () => {
    expect(baselineInput.safeParse({}).error?.issues[0].path).toEqual(["csv"]);
    expect(baselineInput.safeParse({ csv: "value\n1", values: [1] }).success).toBe(false);
    expect(baselineInput.safeParse({ values: [1, 2], analogue: { scaleFactor: 0, note: "x" } }).error?.issues[0].path).toEqual(["analogue", "scaleFactor"]);
    expect(panelBlendRuleInput.safeParse({ rule: "organiser" }).error?.issues[0].path).toEqual(["panelWeight"]);
    expect(panelBlendRuleInput.safeParse({ rule: "equal", panelWeight: 0.4 }).error?.issues[0].path).toEqual(["panelWeight"]);
    expect(panelBlendRuleInput.safeParse({ rule: "organiser", panelWeight: 1.2 }).error?.issues[0].path).toEqual(["panelWeight"]);
  });
});

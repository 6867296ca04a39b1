import { describe, expect, it } from "vitest";
import regression from "../../lib/forecast/methods/regression";
import { ForecastInputError } from "../../lib/forecast/types";
import { expectClose, runR } from "../stats/rscript";

describe("regression method against R lm() + predict.lm(interval = 'prediction') run now via Rscript", () => {
  it("mtcars[1:28]: mpg on wt, hp, qsec; forecast the last 4 cars with 80% and 95% intervals", () => {
    const rows = runR(`d <- mtcars[1:28, ]; nd <- mtcars[29:32, ]
f <- lm(mpg ~ wt + hp + qsec, data = d)
p80 <- predict(f, nd, interval = "prediction", level = 0.8); p95 <- predict(f, nd, interval = "prediction", level = 0.95)
out(d$mpg); out(d$wt); out(d$hp); out(d$qsec); out(nd$wt); out(nd$hp); out(nd$qsec)
out(coef(f)); out(fitted(f)); out(p80[, "fit"]); out(p80[, "lwr"]); out(p80[, "upr"]); out(p95[, "lwr"]); out(p95[, "upr"])`);
    const [y, wt, hp, qsec, fwt, fhp, fqsec, coef, fitted, mean, l80, u80, l95, u95] = rows;
    const fit = regression.fit({ y, season: 1, x: [wt, hp, qsec], xNames: ["wt", "hp", "qsec"] });
    expectClose([fit.parameters.intercept, fit.parameters.wt, fit.parameters.hp, fit.parameters.qsec], coef, 1e-11, "coef");
    expectClose(fit.fitted, fitted, 1e-12, "fitted");
    const f = regression.forecast(fit, 4, [80, 95], [fwt, fhp, fqsec]);
    expectClose(f.mean, mean, 1e-12, "mean");
    expectClose(f.lower["80"], l80, 1e-11, "lower 80");
    expectClose(f.upper["80"], u80, 1e-11, "upper 80");
    expectClose(f.lower["95"], l95, 1e-11, "lower 95");
    expectClose(f.upper["95"], u95, 1e-11, "upper 95");
  });
});

describe("regression method: errors say what to fix", () => {
  const y = [10, 12, 15, 14, 18, 21, 20, 24];
  const price = [5, 5.5, 6, 5.8, 6.5, 7, 6.9, 7.4];
  const promo = [0, 1, 0, 1, 1, 0, 1, 0];
  it("no explanatory column", () => {
    expect(() => regression.fit({ y, season: 1 })).toThrow(/at least one explanatory column/);
    expect(regression.applicable(y, 1, false)).toBe(false);
    expect(regression.applicable(y, 1, true)).toBe(true);
  });
  it("rank-deficient design names the column", () => {
    const price2 = price.map((p) => 3 * p + 1);
    expect(() => regression.fit({ y, season: 1, x: [price, promo, price2], xNames: ["price", "promo", "price_eur"] })).toThrow(
      /column 'price_eur' is a linear combination of the intercept and 'price', 'promo'/,
    );
    expect(() => regression.fit({ y, season: 1, x: [price, promo, price2], xNames: ["price", "promo", "price_eur"] })).toThrow(ForecastInputError);
  });
  it("a non-finite cell names the column and row", () => {
    const bad = [...promo];
    bad[4] = NaN;
    expect(() => regression.fit({ y, season: 1, x: [price, bad], xNames: ["price", "promo"] })).toThrow(/'promo' at row 5/);
  });
  it("forecasting without futureX, with too few future rows or with the wrong number of columns", () => {
    const fit = regression.fit({ y, season: 1, x: [price, promo], xNames: ["price", "promo"] });
    expect(() => regression.forecast(fit, 2, [80])).toThrow(/needs future values of 'price', 'promo' for each of the 2 forecast steps/);
    expect(() => regression.forecast(fit, 3, [80], [[7.5, 7.6, 7.7], [1, 0]])).toThrow(/column 'promo' has 2 future value\(s\) but the horizon is 3/);
    expect(() => regression.forecast(fit, 2, [80], [[7.5, 7.6]])).toThrow(/fitted on 2 column\(s\)/);
    expect(() => regression.forecast(fit, 2, [80], [[7.5, NaN], [1, 0]])).toThrow(/'price' at future row 2/);
  });
  it("too few rows for the coefficients", () => {
    expect(() => regression.fit({ y: [1, 2, 3], season: 1, x: [[1, 2, 4], [0, 1, 0]] })).toThrow(/at least 4 observations/);
  });
});

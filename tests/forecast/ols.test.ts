import { describe, expect, it } from "vitest";
import { leverage, ols, olsPredict } from "../../lib/forecast/ols";
import { ForecastInputError } from "../../lib/forecast/types";
import { referenceCsv, referenceText } from "../stats/reference-data";
import { expectClose, runR } from "../stats/rscript";

/** NIST StRD Norris data and certified values (tests/reference-data, docs/methods.md §1a). */
const NORRIS = referenceCsv("nist_strd_norris.csv");
const CERT = JSON.parse(referenceText("nist_strd_norris_certified.json")) as {
  B0: { estimate: string; sd: string };
  B1: { estimate: string; sd: string };
  residual_sd: string;
  r_squared: string;
  anova: { regression: { ss: string; F: string }; residual: { ss: string; ms: string; df: number } };
};

describe("ols: NIST StRD Norris certified values [SOURCE via copies] (docs/methods.md §1a)", () => {
  const fit = ols(NORRIS.y, [NORRIS.x]);
  const rel = (a: number, b: string) => Math.abs(a - Number(b)) / Math.abs(Number(b));
  it("n = 36, coefficients B0, B1 to 1e-11 relative (NIST certifies 15 digits)", () => {
    expect(fit.n).toBe(36);
    expect(rel(fit.coefficients[0], CERT.B0.estimate)).toBeLessThan(1e-11);
    expect(rel(fit.coefficients[1], CERT.B1.estimate)).toBeLessThan(1e-11);
  });
  it("standard deviations of B0, B1 and the residual SD to 1e-10 relative", () => {
    expect(rel(fit.standardErrors[0], CERT.B0.sd)).toBeLessThan(1e-10);
    expect(rel(fit.standardErrors[1], CERT.B1.sd)).toBeLessThan(1e-10);
    expect(rel(fit.residualSd, CERT.residual_sd)).toBeLessThan(1e-10);
  });
  it("R², regression SS, residual SS and MS, F, residual df to 1e-10 relative", () => {
    expect(rel(fit.rSquared, CERT.r_squared)).toBeLessThan(1e-12);
    expect(rel(fit.ssr, CERT.anova.regression.ss)).toBeLessThan(1e-10);
    expect(rel(fit.sse, CERT.anova.residual.ss)).toBeLessThan(1e-10);
    expect(rel(fit.sse / fit.dfResidual, CERT.anova.residual.ms)).toBeLessThan(1e-10);
    expect(rel(fit.f, CERT.anova.regression.F)).toBeLessThan(1e-10);
    expect(fit.dfResidual).toBe(CERT.anova.residual.df);
  });
  it("cov(B0, B1) = −7.74327536339570e-05 (GSL test comment, 'computed from octave'; not NIST-certified)", () => {
    // cov = s²·[(X'X)⁻¹]₀₁ = s²·(x'Ax with x = e0+e1 − e0'Ae0 − e1'Ae1)/2
    const s2 = fit.residualSd ** 2;
    const a00 = leverage(fit, [1, 0]);
    const a11 = leverage(fit, [0, 1]);
    const a01 = (leverage(fit, [1, 1]) - a00 - a11) / 2;
    expect(Math.abs(s2 * a01 - -7.7432753633957e-5) / 7.7432753633957e-5).toBeLessThan(1e-8);
  });
});

describe("ols against R lm() and predict.lm() run now via Rscript", () => {
  it("mtcars: mpg ~ wt + hp + qsec + am — coefficients, SEs, sigma, R², adjusted R², F", () => {
    const rows = runR(`d <- mtcars; f <- lm(mpg ~ wt + hp + qsec + am, data = d); s <- summary(f)
out(d$mpg); out(d$wt); out(d$hp); out(d$qsec); out(d$am)
out(coef(f)); out(s$coefficients[, 2]); out(c(s$sigma, s$r.squared, s$adj.r.squared, s$fstatistic[1], deviance(f)))
out(fitted(f))`);
    const [mpg, wt, hp, qsec, am, coef, se, stats, fitted] = rows;
    const fit = ols(mpg, [wt, hp, qsec, am], { names: ["wt", "hp", "qsec", "am"] });
    expect(fit.names).toEqual(["(Intercept)", "wt", "hp", "qsec", "am"]);
    expectClose(fit.coefficients, coef, 1e-11, "coef");
    expectClose(fit.standardErrors, se, 1e-11, "se");
    expectClose([fit.residualSd, fit.rSquared, fit.adjustedRSquared, fit.f, fit.sse], stats, 1e-11, "stats");
    expectClose(fit.fitted, fitted, 1e-12, "fitted");
  });

  it("mtcars: prediction intervals at 80% and 95% equal predict(..., interval = 'prediction')", () => {
    const nd = { wt: [2.5, 3.2, 5.5], hp: [110, 180, 300], qsec: [18, 16.5, 15], am: [1, 0, 0] };
    const rows = runR(`d <- mtcars; f <- lm(mpg ~ wt + hp + qsec + am, data = d)
nd <- data.frame(wt = c(2.5, 3.2, 5.5), hp = c(110, 180, 300), qsec = c(18, 16.5, 15), am = c(1, 0, 0))
p80 <- predict(f, nd, interval = "prediction", level = 0.8); p95 <- predict(f, nd, interval = "prediction", level = 0.95)
out(p80[, "fit"]); out(p80[, "lwr"]); out(p80[, "upr"]); out(p95[, "lwr"]); out(p95[, "upr"])
out(d$mpg); out(d$wt); out(d$hp); out(d$qsec); out(d$am)`);
    const [mean, l80, u80, l95, u95, mpg, wt, hp, qsec, am] = rows;
    const fit = ols(mpg, [wt, hp, qsec, am]);
    const pr = olsPredict(fit, [nd.wt, nd.hp, nd.qsec, nd.am], [80, 95]);
    expectClose(pr.mean, mean, 1e-12, "fit");
    expectClose(pr.lower["80"], l80, 1e-11, "lwr 80");
    expectClose(pr.upper["80"], u80, 1e-11, "upr 80");
    expectClose(pr.lower["95"], l95, 1e-11, "lwr 95");
    expectClose(pr.upper["95"], u95, 1e-11, "upr 95");
  });

  it("swiss: Fertility on all five columns, coefficients and 95% prediction interval for two rows", () => {
    const rows = runR(`f <- lm(Fertility ~ ., data = swiss)
nd <- swiss[c(3, 40), -1]; p <- predict(f, nd, interval = "prediction", level = 0.95)
out(coef(f)); out(summary(f)$coefficients[, 2]); out(p[, "lwr"]); out(p[, "upr"])
for (j in 1:6) out(swiss[[j]])`);
    const [coef, se, lwr, upr, y, ...xs] = rows;
    const fit = ols(y, xs);
    expectClose(fit.coefficients, coef, 1e-11, "coef");
    expectClose(fit.standardErrors, se, 1e-11, "se");
    const pr = olsPredict(fit, xs.map((c) => [c[2], c[39]]), [95]);
    expectClose(pr.lower["95"], lwr, 1e-11, "lwr");
    expectClose(pr.upper["95"], upr, 1e-11, "upr");
  });
});

describe("ols: errors name the column", () => {
  it("a column that duplicates another (times 2) is reported as rank-deficient, by name", () => {
    const x1 = [1, 2, 3, 4, 5, 6];
    const x2 = x1.map((v) => 2 * v);
    expect(() => ols([1, 3, 2, 5, 4, 6], [x1, x2], { names: ["price", "price2"] })).toThrow(
      /column 'price2' is a linear combination of the intercept and 'price'/,
    );
  });
  it("a constant column is a combination of the intercept; an all-zero column is named as such", () => {
    expect(() => ols([1, 3, 2, 5], [[7, 7, 7, 7]], { names: ["promo"] })).toThrow(/'promo' is a linear combination of the intercept/);
    expect(() => ols([1, 3, 2, 5], [[0, 0, 0, 0]], { names: ["z"] })).toThrow(/'z' is all zeros/);
  });
  it("too few rows, NaN cells, wrong lengths", () => {
    expect(() => ols([1, 2], [[1, 2]])).toThrow(ForecastInputError);
    expect(() => ols([1, 2, 3, 4], [[1, NaN, 3, 4]], { names: ["a"] })).toThrow(/'a' at row 2/);
    expect(() => ols([1, 2, 3, 4], [[1, 2, 3]], { names: ["a"] })).toThrow(/'a' has 3 values/);
  });
});

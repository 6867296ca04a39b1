/**
 * The launch baseline (lib/forecast/launch.ts, docs/methods.md §19): analogues' Bass p, q carried to
 * a new product whose market potential comes from the panel.
 *
 * Reference: the same simulation written independently in R (stats; its own RNG, set.seed(1),
 * 40,000 draws) from R's own `nls` fits of the analogues (algorithm "port") and `vcov`: an equal
 * mixture over analogues, (p, q) from MASS-free bivariate normal draws (Cholesky by `chol`),
 * redrawn while p ≤ 0 or q < 0, m lognormal through the given median and P10–P90 range, period
 * errors with the analogue's residual sd scaled by m/m_analogue, held at 0. Our quantiles must
 * agree within Monte Carlo error: 4 standard errors of the difference of two sample quantiles
 * (asymptotic normality of sample quantiles; Serfling 1980 §2.3.3), density from a normal with
 * the draws' sd. The lognormal's σ = ln(high/low)/(2·1.2816) by hand.
 */
import { describe, expect, it } from "vitest";
import { LAUNCH_DRAWS, launchForecast, marketPotentialFromRange } from "../../lib/forecast/launch";
import { mcQuantileTolerance, rEval, rVector } from "../helpers/r";

describe("launch forecast", () => {
  it("market potential: lognormal σ = ln(high/low)/(2·z0.9), refused out of order", () => {
    // hand: ln(40000/10000)/(2·1.2815516) = 1.3862944/2.5631031 = 0.5408655
    expect(marketPotentialFromRange(10000, 20000, 40000, "given").sigmaLog).toBeCloseTo(0.5408655, 6);
    expect(() => marketPotentialFromRange(20000, 10000, 40000, "given")).toThrow(/low < median < high/);
    expect(() => marketPotentialFromRange(0, 1, 2, "given")).toThrow(/0 < low/);
  });

  it("the first-year total and a period's adoptions agree with R's simulation of the same model", () => {
    const r = rEval(`Fb <- function(t, p, q) (1 - exp(-(p + q) * t)) / (1 + (q / p) * exp(-(p + q) * t))
      set.seed(3); a1 <- round(8000 * (Fb(1:10, 0.015, 0.42) - Fb(0:9, 0.015, 0.42)) * exp(rnorm(10, 0, 0.06)), 1)
      a2 <- round(3000 * (Fb(1:8, 0.03, 0.35) - Fb(0:7, 0.03, 0.35)) * exp(rnorm(8, 0, 0.06)), 1)
      out("a1", a1); out("a2", a2)
      fits <- lapply(list(a1, a2), function(y) { t <- seq_along(y)
        nls(y ~ m * (Fb(t, p, q) - Fb(t - 1, p, q)), start = list(p = 0.03, q = 0.38, m = 1.1 * sum(y)),
          algorithm = "port", lower = c(1e-9, 0, 1), control = list(maxiter = 1000, eval.max = 5000)) })
      D <- 40000; H <- 12; med <- 20000; sig <- log(40000 / 10000) / (2 * qnorm(0.9))
      set.seed(1); tot <- numeric(D); s3 <- numeric(D); w5 <- numeric(D)
      for (d in 1:D) { f <- fits[[(d - 1) %% 2 + 1]]; cf <- coef(f); L <- t(chol(vcov(f)[1:2, 1:2]))
        repeat { z <- L %*% rnorm(2); p <- cf[1] + z[1]; q <- cf[2] + z[2]; if (p > 0 && q >= 0) break }
        m <- med * exp(sig * rnorm(1)); s <- sqrt(deviance(f) / (length(fitted(f)) - 3)) * m / cf[3]
        v <- pmax(0, m * (Fb(1:H, p, q) - Fb(0:(H - 1), p, q)) + s * rnorm(H)); tot[d] <- sum(v); s3[d] <- v[3]; w5[d] <- sum(v[5:H]) }
      out("tot", quantile(tot, c(0.025, 0.1, 0.5, 0.9, 0.975))); out("totsd", sd(tot))
      out("s3", quantile(s3, c(0.1, 0.9))); out("s3sd", sd(s3))
      out("w5", quantile(w5, c(0.1, 0.9))); out("w5sd", sd(w5))`, { withForecast: false });
    const fc = launchForecast(
      [{ name: "first", values: r.a1 }, { name: "second", values: r.a2 }],
      marketPotentialFromRange(10000, 20000, 40000, "given"),
      12,
      [80, 95],
    );
    const tol = (p: number, sd: number) => mcQuantileTolerance(p, sd, LAUNCH_DRAWS, 40000);
    expect(Math.abs(fc.total.lower["95"] - r.tot[0])).toBeLessThan(tol(0.025, r.totsd[0]));
    expect(Math.abs(fc.total.lower["80"] - r.tot[1])).toBeLessThan(tol(0.1, r.totsd[0]));
    expect(Math.abs(fc.total.upper["80"] - r.tot[3])).toBeLessThan(tol(0.9, r.totsd[0]));
    expect(Math.abs(fc.total.upper["95"] - r.tot[4])).toBeLessThan(tol(0.975, r.totsd[0]));
    expect(Math.abs(fc.steps[2].lower["80"] - r.s3[0])).toBeLessThan(tol(0.1, r.s3sd[0]));
    expect(Math.abs(fc.steps[2].upper["80"] - r.s3[1])).toBeLessThan(tol(0.9, r.s3sd[0]));
    // the figure lies inside its own range
    expect(fc.total.lower["80"]).toBeLessThan(fc.total.mean);
    expect(fc.total.mean).toBeLessThan(fc.total.upper["80"]);
    expect(fc.analogues.map((a) => a.name)).toEqual(["first", "second"]);
    // The total of periods 5..12 after launch: R's simulated launches summed over [5:12].
    const late = launchForecast([{ name: "first", values: r.a1 }, { name: "second", values: r.a2 }], marketPotentialFromRange(10000, 20000, 40000, "given"), 12, [80, 95], undefined, 5);
    expect(Math.abs(late.total.lower["80"] - r.w5[0])).toBeLessThan(tol(0.1, r.w5sd[0]));
    expect(Math.abs(late.total.upper["80"] - r.w5[1])).toBeLessThan(tol(0.9, r.w5sd[0]));
    expect(() => launchForecast([{ name: "first", values: r.a1 }], marketPotentialFromRange(10000, 20000, 40000, "given"), 12, [80], undefined, 13)).toThrow(/first period/);
  });

  it("names the analogue the fit refuses", () => {
    const m = marketPotentialFromRange(1, 2, 3, "given");
    expect(() => launchForecast([{ name: "Wren-1", values: [1, 2, 3] }], m, 4, [80])).toThrow(/analogue 'Wren-1': Bass: needs at least 5/);
    expect(() => launchForecast([], m, 4, [80])).toThrow(/at least one/);
  });
});

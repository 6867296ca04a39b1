/**
 * R code for the scores of Cooke's classical model on calibration questions, as docs/methods.md
 * §21 states them (Cooke 1991): each expert's answers (P5, P50, P95) put the true value into one
 * of four bins with probabilities p = (0.05, 0.45, 0.45, 0.05); calibration is
 * 1 − F_χ²(3)(2N·I(s, p)) with `pchisq`, I the relative information of the bin shares s; information
 * is the mean over questions of Σ p_k ln(p_k/(x_k − x_{k−1})) + ln(U* − L*) on the intrinsic range
 * of all answers and the true value with a 10% overshoot. Shared by the app tests that check the
 * scores over HTTP (tests/app/practice.test.ts, tests/app/api-performance-weights.test.ts).
 */
import { rVector } from "./r";

/**
 * R code printing, with the `out(x)` of tests/stats/rscript.ts, the experts' calibration scores
 * on one line and their information scores on the next. `answers[e][j]` is expert e's
 * (P5, P50, P95) on question j; only the first `truth.length` questions are scored.
 */
export function classicalScoresInR(answers: readonly (readonly (readonly number[])[])[], truth: readonly number[]): string {
  const n = truth.length;
  const question = (j: number) => `list(${answers.map((a) => rVector(a[j])).join(", ")})`;
  return `
    p <- c(0.05, 0.45, 0.45, 0.05)
    Q <- list(${truth.map((_, j) => question(j)).join(", ")})
    truth <- ${rVector(truth)}
    cal <- c(); inf <- c()
    for (e in 1:${answers.length}) {
      bins <- c(0, 0, 0, 0); info <- 0
      for (j in 1:${n}) {
        a <- Q[[j]][[e]]; x <- truth[j]
        k <- if (x <= a[1]) 1 else if (x <= a[2]) 2 else if (x <= a[3]) 3 else 4
        bins[k] <- bins[k] + 1
        v <- c(unlist(Q[[j]]), x); L <- min(v); U <- max(v)
        Ls <- L - 0.1 * (U - L); Us <- U + 0.1 * (U - L)
        info <- info + sum(p * log(p / diff(c(Ls, a, Us)))) + log(Us - Ls)
      }
      s <- bins / ${n}
      I <- sum(ifelse(s > 0, s * log(s / p), 0))
      cal <- c(cal, pchisq(2 * ${n} * I, 3, lower.tail = FALSE)); inf <- c(inf, info / ${n})
    }
    out(cal); out(inf)
  `;
}

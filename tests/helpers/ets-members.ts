/**
 * R code and names for the ETS family's members as lib/forecast/ets/family.ts fits them (A errors:
 * trend N/A/Ad, season N/A; M errors when every value is above zero: trend N/A/Ad, season N/M;
 * seasonal members only with a season), each fitted by R's forecast::ets, for the tests of the
 * Akaike-weighted ETS method and of the combination that uses it.
 */
/** R: every member of our family fitted by ets(), its values and forecasts, and the Akaike weights. */
export const R_MEMBERS = `pf <- function(f, h) {
  # forecast(f)$mean, except for an M season: the point forecasts of table 2.1 from R's final states.
  if (!grepl("M\\\\)$", f$method)) return(as.numeric(forecast(f, h = h)$mean))
  x <- f$states[length(f$x) + 1, ]; ph <- if (grepl("Ad", f$method)) f$par["phi"] else 1
  tr <- if ("b" %in% names(x)) x["b"] else 0; sv <- x[grepl("^s", names(x))]; m <- length(sv)
  as.numeric((x["l"] + cumsum(ph^(1:h)) * tr) * sv[((m - (1:h)) %% m) + 1])
}
members <- function(y, h, origins) {
  m <- frequency(y); pos <- all(y > 0); nm <- c(); aicc <- c(); mean <- c(); fits <- list()
  for (e in c("A", "M")) { if (e == "M" && !pos) next
    for (t in c("N", "A", "Ad")) for (s in c("N", "A", "M")) {
      if (s == "M" && (e == "A" || !pos)) next
      if (s == "A" && e == "M") next
      if (s != "N" && m < 2) next
      f <- ets(y, model = paste0(e, substr(t, 1, 1), s), damped = t == "Ad")
      name <- paste0(e, t, s); nm <- c(nm, name); aicc <- c(aicc, f$aicc); fits[[name]] <- f
      mean <- rbind(mean, pf(f, h))
      out(paste0("par.", name), f$par[c("alpha", "beta", "gamma", "phi")]); out(paste0("states.", name), f$states[1, ])
      out(paste0("aicc.", name), f$aicc) } }
  w <- exp(-(aicc - min(aicc)) / 2); w <- w / sum(w)
  out("w", w); out("mean", colSums(w * mean)); out("h", h); out("m", m)
  for (t in origins) {
    yt <- window(y, end = time(y)[t])
    o <- sapply(nm, function(k) pf(ets(yt, model = fits[[k]], use.initial.values = TRUE), h))
    out(paste0("origin.", t), o %*% w) }
  invisible(list(names = nm, mean = colSums(w * mean)))
}
`;

/** Member names in the order R_MEMBERS fits them (our family's order too). */
export function memberNames(m: number, positive: boolean): string[] {
  const out: string[] = [];
  for (const e of ["A", "M"]) {
    if (e === "M" && !positive) continue;
    for (const t of ["N", "A", "Ad"])
      for (const s of ["N", "A", "M"]) {
        if (s === "M" && (e === "A" || !positive)) continue;
        if (s === "A" && e === "M") continue;
        if (s !== "N" && m < 2) continue;
        out.push(`${e}${t}${s}`);
      }
  }
  return out;
}


# R's forecast::ets() and forecast::auto.arima(), default settings, on M3 series for the M3 bench
# (bench/m3-coverage.ts, option --r). Reference figures only: nothing is cached.
#
# Usage: Rscript bench/m3-r.R INPUT OUTPUT PART PARTS
#   INPUT: one series a line, tab-separated: id, frequency, h, training values (space-separated).
#   OUTPUT: one forecast a line, tab-separated: id, model (ets or arima), seconds (that fit and
#   forecast), then mean, lo80, hi80, lo95, hi95 (h space-separated values each); a failed fit
#   writes NA values.
#   PART, PARTS: this process takes the lines i with (i - 1) %% PARTS == PART - 1, so that
#   PARTS processes share the file.
suppressMessages(library(forecast))
args <- commandArgs(trailingOnly = TRUE)
lines <- readLines(args[1])
part <- as.integer(args[3])
parts <- as.integer(args[4])
out <- file(args[2], open = "w")
for (i in seq_along(lines)) {
  if ((i - 1) %% parts != part - 1) next
  f <- strsplit(lines[i], "\t", fixed = TRUE)[[1]]
  id <- f[1]
  m <- as.integer(f[2])
  h <- as.integer(f[3])
  y <- ts(as.numeric(strsplit(f[4], " ", fixed = TRUE)[[1]]), frequency = m)
  for (model in c("ets", "arima")) {
    t0 <- proc.time()[["elapsed"]]
    fc <- tryCatch({
      fit <- if (model == "ets") ets(y) else auto.arima(y)
      forecast(fit, h = h, level = c(80, 95))
    }, error = function(e) NULL)
    secs <- proc.time()[["elapsed"]] - t0
    vals <- if (is.null(fc)) rep(list(rep(NA, h)), 5) else
      list(fc$mean, fc$lower[, 1], fc$upper[, 1], fc$lower[, 2], fc$upper[, 2])
    cells <- vapply(vals, function(v) paste(sprintf("%.15g", as.numeric(v)), collapse = " "), "")
    writeLines(paste(c(id, model, format(secs, digits = 6), cells), collapse = "\t"), out)
  }
}
close(out)

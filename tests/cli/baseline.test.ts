import { spawnSync } from "node:child_process";
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join, resolve } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { main } from "../../lib/cli/main";
import { runRBatch } from "../stats/rscript";

const BIN = resolve(__dirname, "../../bin/triangulate.mjs");
const NIST12 = new URL("../reference-data/nist_handbook_6431_ses12.csv", import.meta.url).pathname;
let dir: string;
let cwd: string;

/** `triangulate …` as a process (`node bin/triangulate.mjs`), for what is about the process: exit code, stdout, real stdin. */
function cliProcess(args: string[], input?: string) {
  const r = spawnSync(process.execPath, [BIN, ...args], { encoding: "utf8", input, cwd: dir });
  return { code: r.status, out: r.stdout, err: r.stderr };
}

/**
 * `triangulate …` in this process: the command's main function (lib/cli/main.ts, which the
 * binary calls) with the test's output streams, from the same working directory. Saves the
 * start of a process with the TypeScript loader (about a second) per call.
 */
async function cli(args: string[], input = "") {
  let out = "";
  let err = "";
  const code = await main(args, { out: (t) => void (out += t), err: (t) => void (err += t), stdin: () => input, errIsTTY: false });
  return { code, out, err };
}

/** R's expected values, computed with the test data in one R session (beforeAll). */
let R: Record<string, number[][]>;

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), "triangulate-cli-"));
  cwd = process.cwd();
  process.chdir(dir);
  // The NIST series with a bad cell in row 4 (header = row 1) and with a gap.
  const lines = readFileSync(NIST12, "utf8").trim().split(/\r?\n/);
  writeFileSync(join(dir, "bad.csv"), lines.map((l, i) => (i === 3 ? "3,abc" : l)).join("\n"));
  R = runRBatch({
    // Public test data: R's datasets::AirPassengers, Nile, LakeHuron and WWWusage, written by R
    // itself; R's datasets::freeny (quarterly revenue with four explanatory series) with the last
    // 4 values blanked so that their explanatory rows become future rows.
    files: `write.csv(data.frame(value = as.numeric(AirPassengers)), "${dir}/airpassengers.csv", row.names = FALSE)
      write.csv(data.frame(year = as.numeric(time(Nile)), flow = as.numeric(Nile)), "${dir}/nile.csv", row.names = FALSE)
      d <- freeny; names(d) <- c("value", "lagrev", "price", "income", "potential"); d$value <- as.numeric(d$value)
      d$value[36:39] <- NA; write.csv(d, "${dir}/freeny.csv", row.names = FALSE, na = "")
      write.csv(data.frame(value = as.numeric(LakeHuron)), "${dir}/lakehuron.csv", row.names = FALSE)
      write.csv(data.frame(value = as.numeric(WWWusage)), "${dir}/wwwusage.csv", row.names = FALSE)
      write.csv(data.frame(value = as.numeric(Nile)), "${dir}/nile-value.csv", row.names = FALSE)`,
    naive: `y <- read.csv("${NIST12}")$y; f <- forecast::naive(y, h = 3, level = c(80, 95))
      out(c(f$mean, f$lower[, 1], f$upper[, 1], f$lower[, 2], f$upper[, 2]))`,
    total: `y <- read.csv("${NIST12}")$y; f <- forecast::naive(y, h = 3, level = 80)
      s <- (f$mean[1] - f$lower[1, 1]) / qnorm(0.9); z <- qnorm(c(0.9, 0.975))
      out(c(sum(f$mean), sum(f$mean) - z * s * sqrt(14), sum(f$mean) + z * s * sqrt(14), sum(f$upper)))`,
    from2: `y <- read.csv("${NIST12}")$y; f <- forecast::naive(y, h = 3, level = 80)
      s <- (f$mean[1] - f$lower[1, 1]) / qnorm(0.9); z <- qnorm(c(0.9, 0.975)); m <- sum(f$mean[2:3])
      out(c(m, m - z * s * 3, m + z * s * 3))`,
    freeny: `d <- read.csv("${dir}/freeny.csv"); fit <- lm(value ~ lagrev + price + income + potential, data = d[1:35, ])
      p80 <- predict(fit, d[36:39, ], interval = "prediction", level = 0.8); p95 <- predict(fit, d[36:39, ], interval = "prediction", level = 0.95)
      out(c(coef(fit), p80, p95[, 2:3]))`,
    nileDrift: `out(forecast::rwf(Nile, h = 2, drift = TRUE)$mean)`,
    lakeDrift: `f <- forecast::rwf(as.numeric(LakeHuron), h = 3, drift = TRUE, level = 80); out(c(f$mean, f$lower, f$upper))`,
  });
}, 120_000); // one R start with forecast: seconds, longer on a loaded machine

afterAll(() => {
  process.chdir(cwd);
  rmSync(dir, { recursive: true, force: true });
});

describe("triangulate baseline", () => {
  it("--method naive on the NIST 12-point series equals R's forecast::naive, bounds included", () => {
    // As a process: the binary's exit code and standard output.
    const res = cliProcess(["baseline", NIST12, "--value", "y", "--method", "naive", "--horizon", "3", "--levels", "80,95"]);
    expect(res.err).toBe("");
    expect(res.code).toBe(0);
    const out = JSON.parse(res.out);
    // Expected: R 4.2.2, forecast 8.20, naive(y, h = 3, level = c(80, 95)) on the NIST e-Handbook §6.4.3.1 series.
    const rv = R.naive[0];
    expect(out.file).toBe(NIST12);
    expect(out.method).toBe("naive");
    expect(out.horizon).toBe(3);
    expect(out.forecast.map((s: { mean: number }) => s.mean)).toEqual([70, 70, 70]);
    out.forecast.forEach((s: { step: number; lower: Record<string, number>; upper: Record<string, number> }, i: number) => {
      expect(s.step).toBe(i + 1);
      expect(s.lower["80"]).toBeCloseTo(rv[3 + i], 9);
      expect(s.upper["80"]).toBeCloseTo(rv[6 + i], 9);
      expect(s.lower["95"]).toBeCloseTo(rv[9 + i], 9);
      expect(s.upper["95"]).toBeCloseTo(rv[12 + i], 9);
    });
    // In-sample naive MASE is 1 by construction and MAE = 29/11 (docs/methods.md §4, R accuracy()).
    expect(out.accuracy.insample.mase).toBeCloseTo(1, 12);
    expect(out.accuracy.insample.mae).toBeCloseTo(29 / 11, 12);
    expect(out.fitted[0]).toBeNull();
    expect(out.fitted[1]).toBe(71);
  });

  it("--total adds the 3-step total of a random walk: mean 3·y_n, variance σ²(1 + 4 + 9), not the sum of step bounds", async () => {
    const res = await cli(["baseline", NIST12, "--value", "y", "--method", "naive", "--horizon", "3", "--total"]);
    expect(res.err).toBe("");
    expect(res.code).toBe(0);
    const out = JSON.parse(res.out);
    // Expected: σ from R's forecast::naive one-step 80% bound, then the total of a random walk,
    // var = σ² Σ_{j=1}^{3} j² (Hyndman et al. 2008 ch. 6 aggregated variance with every c_j = 1).
    const rv = R.total[0];
    expect(out.total.mean).toBeCloseTo(rv[0], 9);
    expect(out.total.lower["80"]).toBeCloseTo(rv[1], 9);
    expect(out.total.lower["95"]).toBeCloseTo(rv[2], 9);
    expect(out.total.upper["80"]).toBeCloseTo(rv[3], 9);
    expect(out.total.upper["95"]).toBeCloseTo(rv[4], 9);
    expect(out.total.upper["80"]).toBeLessThan(rv[5]); // below the sum of the step bounds (R)
    expect((await cli(["baseline", NIST12, "--value", "y", "--method", "naive", "--horizon", "3"])).out).not.toContain('"total"');
  });

  it("--from 2 --horizon 3 --total: the total of periods 2..3 of a random walk, variance σ²(4 + 4 + 1)", async () => {
    const res = await cli(["baseline", NIST12, "--value", "y", "--method", "naive", "--horizon", "3", "--total", "--from", "2"]);
    expect(res.err).toBe("");
    expect(res.code).toBe(0);
    const out = JSON.parse(res.out);
    // Expected: σ from R's forecast::naive as above; innovation ε_{n+i} enters steps max(i, 2)..3:
    // ε1 and ε2 twice, ε3 once, so var = σ²(2² + 2² + 1²) = 9σ² (hand computation); mean 2·y_n.
    const rv = R.from2[0];
    expect(out.total).toMatchObject({ from: 2, to: 3 });
    expect(out.total.mean).toBeCloseTo(rv[0], 9);
    expect(out.total.lower["80"]).toBeCloseTo(rv[1], 9);
    expect(out.total.lower["95"]).toBeCloseTo(rv[2], 9);
    expect(out.total.upper["80"]).toBeCloseTo(rv[3], 9);
    expect(out.total.upper["95"]).toBeCloseTo(rv[4], 9);
    const table = await cli(["baseline", NIST12, "--value", "y", "--method", "naive", "--horizon", "3", "--total", "--from", "2", "--format", "table"]);
    expect(table.out).toContain("total of steps 2-3:");
  });

  it("--from after --horizon, or without --total, is a usage error (exit 2)", async () => {
    const late = await cli(["baseline", NIST12, "--value", "y", "--horizon", "3", "--total", "--from", "4"]);
    expect(late.code).toBe(2);
    expect(late.err).toContain("--from 4 is after the last period, --horizon 3");
    const alone = await cli(["baseline", NIST12, "--value", "y", "--horizon", "3", "--from", "2"]);
    expect(alone.code).toBe(2);
    expect(alone.err).toContain("give --total with it");
    const zero = await cli(["baseline", NIST12, "--value", "y", "--horizon", "3", "--total", "--from", "0"]);
    expect(zero.code).toBe(2);
  });

  it("the automatic baseline combines ets-weighted and theta and keeps the field names of issue 2", async () => {
    const res = await cli(["baseline", "airpassengers.csv", "--season", "12", "--horizon", "12"]);
    expect(res.err).toBe("");
    expect(res.code).toBe(0);
    const out = JSON.parse(res.out);
    for (const key of ["file", "method", "parameters", "season", "horizon", "forecast", "fitted", "accuracy", "candidates", "notes"]) {
      expect(out).toHaveProperty(key);
    }
    expect(Object.keys(out.accuracy.insample).sort()).toEqual(["mae", "mape", "mase", "rmse", "smape"]);
    expect(out.season).toBe(12);
    expect(out.forecast).toHaveLength(12);
    expect(out.fitted).toHaveLength(144);
    // docs/methods.md §20: equal weights on ETS (its members weighted by AICc) and Theta; no candidates are scored.
    expect(out.method).toBe("combination");
    expect(out.combination.map((c: { method: string }) => c.method)).toEqual(["ets-weighted", "theta"]);
    expect(out.parameters).toEqual({ "ets-weighted": 0.5, theta: 0.5 });
    expect(out.candidates).toEqual([]);
  });

  it("regression uses the explanatory columns and their future rows like R's lm() and predict()", async () => {
    // freeny.csv: written by R in beforeAll.
    const res = await cli(["baseline", "freeny.csv", "--method", "regression", "--levels", "80,95"]);
    expect(res.err).toBe("");
    const out = JSON.parse(res.out);
    expect(out.horizon).toBe(4);
    // Expected: R 4.2.2 lm() on the same CSV, predict(interval = "prediction") at 80% and 95%.
    const rv = R.freeny[0];
    expect(out.parameters.intercept).toBeCloseTo(rv[0], 8);
    expect(out.parameters.potential).toBeCloseTo(rv[4], 8);
    out.forecast.forEach((s: { mean: number; lower: Record<string, number>; upper: Record<string, number> }, i: number) => {
      expect(s.mean).toBeCloseTo(rv[5 + i], 9);
      expect(s.lower["80"]).toBeCloseTo(rv[9 + i], 9);
      expect(s.upper["80"]).toBeCloseTo(rv[13 + i], 9);
      expect(s.lower["95"]).toBeCloseTo(rv[17 + i], 9);
      expect(s.upper["95"]).toBeCloseTo(rv[21 + i], 9);
    });
  });

  it("forecasts several files in one call, in order, reading - from standard input", () => {
    const nile = readFileSync(join(dir, "nile.csv"), "utf8");
    // As a process: "-" is the process's real standard input.
    const res = cliProcess(["baseline", NIST12, "-", "--value", "flow", "--method", "drift", "--horizon", "2"], nile);
    // NIST12 has no 'flow' column, so this call must fail as a whole …
    expect(res.code).toBe(1);
    expect(res.out).toBe("");
    expect(res.err).toContain(`${NIST12}: no column named 'flow'`);
    // … while two files that both have the column give an array in the order given.
    writeFileSync(join(dir, "nile2.csv"), nile);
    const ok = cliProcess(["baseline", "nile2.csv", "-", "--value", "flow", "--method", "drift", "--horizon", "2"], nile);
    expect(ok.err).toBe("");
    const arr = JSON.parse(ok.out);
    expect(Array.isArray(arr)).toBe(true);
    expect(arr.map((x: { file: string }) => x.file)).toEqual(["nile2.csv", "-"]);
    // Drift forecasts from R 4.2.2 forecast::rwf(Nile, h = 2, drift = TRUE).
    const rv = R.nileDrift[0];
    expect(arr[1].forecast[0].mean).toBeCloseTo(rv[0], 9);
    expect(arr[1].forecast[1].mean).toBeCloseTo(rv[1], 9);
  });

  describe("a batch of files", () => {
    const files = ["nile.csv", "lakehuron.csv", "wwwusage.csv", "airpassengers.csv"];
    it("fits several files on two worker threads and gives each file's single run, in the order given", async () => {
      const names = files.map((f) => (f === "nile.csv" ? "nile-value.csv" : f));
      const batch = await cli(["baseline", ...names, "--horizon", "6", "--total", "--jobs", "2"]);
      expect(batch.err).toBe("");
      expect(batch.code).toBe(0);
      const arr = JSON.parse(batch.out) as { file: string }[];
      expect(arr.map((x) => x.file)).toEqual(names);
      // The worker threads run the same engine: every figure equals the file's own run.
      for (const [i, name] of names.entries()) {
        const single = await cli(["baseline", name, "--horizon", "6", "--total"]);
        expect(single.code).toBe(0);
        expect(arr[i]).toEqual(JSON.parse(single.out));
      }
    });

    it("gives R's drift forecasts for a series of the batch, and refuses --jobs 0", async () => {
      const batch = await cli(["baseline", "nile-value.csv", "lakehuron.csv", "wwwusage.csv", "--method", "drift", "--horizon", "3", "--levels", "80"]);
      expect(batch.code).toBe(0);
      const lake = (JSON.parse(batch.out) as { forecast: { mean: number; lower: Record<string, number>; upper: Record<string, number> }[] }[])[1];
      // Expected: R forecast::rwf(LakeHuron, h = 3, drift = TRUE, level = 80), computed here.
      const rv = R.lakeDrift[0];
      lake.forecast.forEach((s, i) => {
        expect(s.mean).toBeCloseTo(rv[i], 8);
        expect(s.lower["80"]).toBeCloseTo(rv[3 + i], 8);
        expect(s.upper["80"]).toBeCloseTo(rv[6 + i], 8);
      });
      const zero = await cli(["baseline", "nile-value.csv", "lakehuron.csv", "--jobs", "0"]);
      expect(zero.code).toBe(2);
      expect(zero.err).toContain("--jobs must be a whole number of at least 1 (got '0')");
    });

    it("shows a progress line on standard error only when it is a terminal, and clears it", async () => {
      const { main } = await import("../../lib/cli/main");
      const run = async (errIsTTY: boolean) => {
        let out = "";
        let err = "";
        const io = { out: (t: string) => void (out += t), err: (t: string) => void (err += t), stdin: () => "", errIsTTY };
        const code = await main(["baseline", join(dir, "nile-value.csv"), join(dir, "lakehuron.csv"), "--method", "naive", "--horizon", "2", "--jobs", "2"], io);
        return { code, out, err };
      };
      const tty = await run(true);
      expect(tty.code).toBe(0);
      expect(tty.err).toContain("\rtriangulate baseline: fitted 0 of 2 series");
      expect(tty.err).toContain("\rtriangulate baseline: fitted 2 of 2 series");
      expect(tty.err.endsWith("\r\x1b[K")).toBe(true);
      const piped = await run(false);
      expect(piped.err).toBe("");
      expect(piped.out).toBe(tty.out);
      // Naive forecasts: the last value (R's naive()): Nile 1970 = 740, LakeHuron 1972 = 579.96.
      expect((JSON.parse(piped.out) as { forecast: { mean: number }[] }[]).map((x) => x.forecast[0].mean)).toEqual([740, 579.96]);
    });
  });

  it("names file, row and column of a bad cell, exits 1 and writes nothing to stdout", async () => {
    const res = await cli(["baseline", NIST12, "bad.csv", "--value", "y", "--method", "naive"]);
    expect(res.code).toBe(1);
    expect(res.out).toBe("");
    expect(res.err).toBe("triangulate baseline: bad.csv: row 4, column 'y': 'abc' is not a number\n");
  });

  it("refuses a history over the row limit shared with the API (lib/validation/limits.ts) before reading it", async () => {
    writeFileSync(join(dir, "long.csv"), ["value", ...Array.from({ length: 5001 }, (_, i) => String(i % 10))].join("\n"));
    const res = await cli(["baseline", "long.csv"]);
    expect(res.code).toBe(1);
    expect(res.out).toBe("");
    expect(res.err).toContain("long.csv: at most 5000 data rows");
  });

  it("refuses unknown options, bad values and absurd horizons", async () => {
    const unknown = await cli(["baseline", NIST12, "--sesaon", "4"]);
    expect(unknown.code).toBe(2);
    expect(unknown.out).toBe("");
    expect(unknown.err).toContain("Unknown option '--sesaon'");
    const method = await cli(["baseline", NIST12, "--method", "prophecy"]);
    expect(method.code).toBe(2);
    expect(method.err).toContain("--method: unknown method 'prophecy'");
    const season = await cli(["baseline", NIST12, "--season", "1.5"]);
    expect(season.code).toBe(2);
    expect(season.err).toContain("--season must be a whole number of at least 1 (got '1.5')");
    const horizon = await cli(["baseline", NIST12, "--value", "y", "--horizon", "5000"]);
    expect(horizon.code).toBe(1);
    expect(horizon.out).toBe("");
    expect(horizon.err).toContain("horizon 5000 is above the maximum of 1000 steps");
    const missing = await cli(["baseline", "no-such-file.csv"]);
    expect(missing.code).toBe(1);
    expect(missing.err).toContain("no-such-file.csv: cannot read the file (ENOENT)");
  });

  it("loads only the engine: no database, Prisma or Next module is imported by baseline", async () => {
    const root = resolve(__dirname, "../..");
    const probe = join(dir, "probe.mjs");
    writeFileSync(
      probe,
      `import { register } from ${JSON.stringify(join(root, "node_modules/tsx/dist/esm/api/index.mjs"))};
       const seen = [];
       register({ tsconfig: ${JSON.stringify(join(root, "tsconfig.json"))}, onImport: (u) => seen.push(u) });
       const { main } = await import(${JSON.stringify(join(root, "lib/cli/main.ts"))});
       const io = { out: () => {}, err: (t) => process.stderr.write(t), stdin: () => "" };
       const code = await main(["baseline", ${JSON.stringify(NIST12)}, "--value", "y", "--horizon", "2"], io);
       process.stdout.write(JSON.stringify({ code, seen }));`,
    );
    const res = spawnSync(process.execPath, [probe], { encoding: "utf8" });
    const { code, seen } = JSON.parse(res.stdout) as { code: number; seen: string[] };
    expect(code).toBe(0);
    expect(seen.some((u) => u.includes("/lib/forecast/baseline.ts"))).toBe(true);
    expect(seen.filter((u) => /prisma|\/lib\/db|\/next\/|better-sqlite3|\/lib\/cli\/admin/.test(u))).toEqual([]);
  });

  it("prints a table for people and lists the commands", async () => {
    const res = await cli(["baseline", NIST12, "--value", "y", "--method", "naive", "--horizon", "2", "--format", "table"]);
    expect(res.code).toBe(0);
    expect(res.out).toContain("method naive, season 1, horizon 2");
    expect(res.out).toMatch(/step\s+mean\s+lower 80%\s+upper 80%\s+lower 95%\s+upper 95%/);
    const help = await cli(["help"]);
    expect(help.code).toBe(0);
    expect(help.out).toContain("baseline");
    const none = await cli(["frobnicate"]);
    expect(none.code).toBe(2);
    expect(none.err).toContain("unknown command 'frobnicate'");
  });
});

/**
 * Admin commands of the CLI (and the usage check of `serve`), run as a user would: `node bin/triangulate.mjs …` with
 * DATABASE_URL pointing at a fresh, migrated SQLite file. The demo's stored round statistics
 * are checked against R (quantile type 7, median, IQR, sd via Rscript) on the answers found in
 * the database.
 */
import { spawn, spawnSync } from "node:child_process";
import { createHash } from "node:crypto";
import { existsSync, mkdtempSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import Database from "better-sqlite3";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { verifyPassword } from "../../lib/accounts/passwords";
import { main } from "../../lib/cli/main";
import { expectClose, runR, rVector } from "../stats/rscript";

const root = path.resolve(__dirname, "..", "..");
let dir = "";
let dbFile = "";

/** `triangulate …` as a process (`node bin/triangulate.mjs`), for what is about the process: exit code, real stdin, nothing started. */
function runProcess(args: string[], input = ""): { code: number | null; out: string; err: string } {
  const r = spawnSync(process.execPath, [path.join(root, "bin", "triangulate.mjs"), ...args], {
    input,
    cwd: os.tmpdir(), // any working directory must do
    env: { ...process.env, DATABASE_URL: `file:${dbFile}` },
    encoding: "utf8",
  });
  return { code: r.status, out: r.stdout, err: r.stderr };
}

/**
 * `triangulate …` in this process: the main function the binary calls (lib/cli/main.ts), with
 * the test's output streams and DATABASE_URL naming the test's database (set in beforeAll,
 * before the database module loads). Saves the start of a process (about a second) per call.
 */
async function run(args: string[], input = ""): Promise<{ code: number; out: string; err: string }> {
  let out = "";
  let err = "";
  const code = await main(args, { out: (t) => void (out += t), err: (t) => void (err += t), stdin: () => input, errIsTTY: false });
  return { code, out, err };
}

function query<T>(file: string, sql: string, ...params: unknown[]): T[] {
  const conn = new Database(file, { readonly: true });
  try {
    return conn.prepare(sql).all(...params) as T[];
  } finally {
    conn.close();
  }
}

beforeAll(() => {
  dir = mkdtempSync(path.join(os.tmpdir(), "triangulate-cli-"));
  dbFile = path.join(dir, "admin.db");
  const r = spawnSync(path.join(root, "node_modules", ".bin", "prisma"), ["migrate", "deploy"], {
    cwd: root,
    env: { ...process.env, DATABASE_URL: `file:${dbFile}` },
    encoding: "utf8",
  });
  if (r.status !== 0) throw new Error(`migrate deploy failed: ${r.stderr}`);
  process.env.DATABASE_URL = `file:${dbFile}`; // for the commands run in this process
}, 120_000);
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe("create-organiser", () => {
  it("creates an organiser whose password verifies against the stored scrypt hash", async () => {
    // As a process: the binary's exit code and output.
    const r = runProcess(["create-organiser", "--email", "Ida.Penrose@Example.com", "--name", "Ida Penrose", "--password", "correct horse battery"]);
    expect(r.code).toBe(0);
    expect(r.out).toBe("created organiser ida.penrose@example.com (Ida Penrose)\n");
    const [u] = query<{ role: string; passwordHash: string }>(dbFile, `SELECT role, passwordHash FROM User WHERE email = ?`, "ida.penrose@example.com");
    expect(u.role).toBe("organiser");
    expect(u.passwordHash).toMatch(/^scrypt\$15\$8\$1\$/);
    expect(await verifyPassword("correct horse battery", u.passwordHash)).toBe(true);
    expect(await verifyPassword("correct horse battery!", u.passwordHash)).toBe(false);
  });

  it("creates a reviewer with --role reviewer", async () => {
    const r = await run(["create-organiser", "--email", "rev@example.com", "--name", "Rev Iew", "--password", "long enough pass", "--role", "reviewer"]);
    expect(r.code).toBe(0);
    expect(query<{ role: string }>(dbFile, `SELECT role FROM User WHERE email = 'rev@example.com'`)[0].role).toBe("reviewer");
  });

  it("reads the password from standard input with --password -", async () => {
    // As a process: "-" reads the process's real standard input.
    const r = runProcess(["create-organiser", "--email", "stdin@example.com", "--name", "Std In", "--password", "-"], "piped passphrase 42\n");
    expect(r.code, r.err).toBe(0);
    const [u] = query<{ passwordHash: string }>(dbFile, `SELECT passwordHash FROM User WHERE email = 'stdin@example.com'`);
    expect(await verifyPassword("piped passphrase 42", u.passwordHash)).toBe(true);
  });

  it("exits 1 for a taken e-mail and 2 for bad usage", async () => {
    const taken = await run(["create-organiser", "--email", "ida.penrose@example.com", "--name", "Again", "--password", "correct horse battery"]);
    expect(taken.code).toBe(1);
    expect(taken.err).toMatch(/already exists/);
    const short = await run(["create-organiser", "--email", "x@example.com", "--name", "X", "--password", "short"]);
    expect(short.code).toBe(2);
    expect(short.err).toMatch(/--password: at least 12 characters/);
    expect((await run(["create-organiser", "--email", "x@example.com"])).code).toBe(2);
    expect((await run(["create-organiser", "--bogus"])).code).toBe(2);
    expect((await run(["create-organiser", "--email", "y@example.com", "--name", "Y", "--password", "long enough pass", "--role", "admin"])).code).toBe(2);
  });
});

describe("create-token", () => {
  it("prints a new API token of an organiser once; only its SHA-256 digest is stored, with the expiry asked for", async () => {
    const before = Date.now();
    const r = await run(["create-token", "--email", "IDA.PENROSE@example.com", "--name", "nightly export", "--days", "30"]);
    expect(r.code, r.err).toBe(0);
    expect(r.out).toMatch(/^trg_pat_[A-Za-z0-9_-]{43}\n$/);
    const token = r.out.trim();
    // SHA-256 (FIPS 180-4) of the printed token, computed here with node:crypto.
    const digest = createHash("sha256").update(token).digest("hex");
    const rows = query<{ name: string; tokenHash: string; createdAt: number | string; expiresAt: number | string }>(
      dbFile,
      `SELECT t.name, t.tokenHash, t.createdAt, t.expiresAt FROM ApiToken t JOIN User u ON u.id = t.userId WHERE u.email = 'ida.penrose@example.com'`,
    );
    expect(rows).toHaveLength(1);
    expect(rows[0].name).toBe("nightly export");
    expect(rows[0].tokenHash).toBe(digest);
    expect(JSON.stringify(rows)).not.toContain(token);
    // 30 days = 30 × 86 400 000 ms.
    const ms = (v: number | string) => (typeof v === "number" ? v : Date.parse(v));
    expect(ms(rows[0].expiresAt) - ms(rows[0].createdAt)).toBe(30 * 86_400_000);
    expect(ms(rows[0].createdAt)).toBeGreaterThanOrEqual(before - 1000);
    expect(r.err).toMatch(/shown only now/);
  });

  it("exits 1 for an unknown e-mail or a reviewer, 2 for bad usage", async () => {
    const unknown = await run(["create-token", "--email", "nobody@example.com"]);
    expect(unknown.code).toBe(1);
    expect(unknown.err).toMatch(/organiser with e-mail nobody@example.com was not found/);
    expect(unknown.out).toBe("");
    expect((await run(["create-token", "--email", "rev@example.com"])).code).toBe(1);
    const zero = await run(["create-token", "--email", "ida.penrose@example.com", "--days", "0"]);
    expect(zero.code).toBe(2);
    expect(zero.err).toMatch(/--days: at least 1/);
    expect((await run(["create-token", "--days", "30"])).code).toBe(2);
  });
});

describe("demo", () => {
  it("--if-empty loads nothing when accounts exist", async () => {
    const r = await run(["demo", "--if-empty"]);
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/nothing loaded/);
    expect(query(dbFile, `SELECT id FROM Panel`)).toHaveLength(0);
  });

  it("loads the Quillmoor panel: roster, seven invitations, two closed rounds and an open third", async () => {
    const r = await run(["demo"]);
    expect(r.code, r.err).toBe(0);
    const password = /organiser@quillmoor\.example\s+password: (\S+)/.exec(r.out)?.[1];
    expect(password).toBeDefined();
    const [org] = query<{ passwordHash: string }>(dbFile, `SELECT passwordHash FROM User WHERE email = 'organiser@quillmoor.example'`);
    expect(await verifyPassword(password!, org.passwordHash)).toBe(true);
    expect(query(dbFile, `SELECT id FROM User WHERE email = 'reviewer@quillmoor.example' AND role = 'reviewer'`)).toHaveLength(1);
    expect(r.out.match(/\/p\/[A-Za-z0-9_-]{43}/g)).toHaveLength(7);

    const [panel] = query<{ id: string; title: string; status: string }>(dbFile, `SELECT id, title, status FROM Panel WHERE title = 'Year-one unit sales of the Wren-2'`);
    expect(panel).toMatchObject({ title: "Year-one unit sales of the Wren-2", status: "running" });
    const groups = query<{ grp: string; n: number }>(dbFile, `SELECT "group" AS grp, COUNT(*) AS n FROM RosterMember GROUP BY "group" ORDER BY grp`);
    expect(groups).toEqual([{ grp: "engineering", n: 3 }, { grp: "operations", n: 2 }, { grp: "sales", n: 3 }]);
    expect(query(dbFile, `SELECT id FROM Invitation WHERE panelId = ?`, panel.id)).toHaveLength(7);
    const questions = query<{ answerFormat: string; aggregation: string }>(dbFile, `SELECT answerFormat, aggregation FROM Question WHERE panelId = ? ORDER BY position`, panel.id);
    expect(questions).toEqual([{ answerFormat: "three-point", aggregation: "shared" }, { answerFormat: "single", aggregation: "sum-of-parts" }]);
    expect(query<{ number: number; status: string }>(dbFile, `SELECT number, status FROM Round WHERE panelId = ? ORDER BY number`, panel.id)).toEqual([
      { number: 1, status: "closed" },
      { number: 2, status: "closed" },
      { number: 3, status: "open" },
    ]);
    expect(query(dbFile, `SELECT panelId FROM PanelShare WHERE role = 'reviewer'`)).toHaveLength(1);
  });

  it("stores round statistics that equal R's on the stored answers, and the rounds converge", () => {
    const stats = query<{ number: number; position: number; data: string; questionId: string; roundId: string }>(
      dbFile,
      `SELECT r.number, q.position, s.data, s.questionId, s.roundId FROM RoundStatistic s JOIN Round r ON r.id = s.roundId JOIN Question q ON q.id = s.questionId JOIN Panel p ON p.id = r.panelId WHERE p.title = 'Year-one unit sales of the Wren-2' ORDER BY r.number, q.position`,
    );
    expect(stats.map((s) => [s.number, s.position])).toEqual([[1, 1], [1, 2], [2, 1], [2, 2]]);
    const iqrs: number[] = [];
    for (const s of stats.filter((x) => x.position === 1)) {
      // Final answers: each invitation's highest version in that round.
      const rows = query<{ value: number }>(
        dbFile,
        `SELECT a.value FROM Answer a WHERE a.roundId = ? AND a.questionId = ? AND a.version = (SELECT MAX(b.version) FROM Answer b WHERE b.roundId = a.roundId AND b.questionId = a.questionId AND b.invitationId = a.invitationId)`,
        s.roundId,
        s.questionId,
      );
      expect(rows).toHaveLength(7);
      const x = rows.map((r) => r.value);
      const [expected] = runR(`x <- ${rVector(x)}; out(c(quantile(x, c(0.25, 0.5, 0.75), type = 7, names = FALSE), IQR(x), sd(x)))`);
      const d = JSON.parse(s.data);
      expectClose([d.values.q1, d.values.median, d.values.q3, d.values.iqr, d.values.sd], expected, 1e-12, `round ${s.number} vs R`);
      iqrs.push(d.values.iqr);
    }
    expect(iqrs[1]).toBeLessThan(iqrs[0]);
    const total = JSON.parse(stats[1].data).sumOfParts.total;
    const [[rTotal]] = runR(`out(sum(c(2600, 1800, 3400, 1500, 2200, 1200, 2900)))`);
    expect(total).toBe(rTotal);
  });

  it("--if-empty run by three processes at once on an empty database loads the demo exactly once, and all exit 0", async () => {
    const fresh = path.join(dir, "race.db");
    const env = { ...process.env, DATABASE_URL: `file:${fresh}` };
    const m = spawnSync(process.execPath, [path.join(root, "bin", "triangulate.mjs"), "migrate"], { cwd: root, env, encoding: "utf8" });
    expect(m.status, m.stderr).toBe(0);
    const runs = await Promise.all(
      [0, 1, 2].map(
        () =>
          new Promise<{ code: number | null; out: string; err: string }>((resolve) => {
            const child = spawn(process.execPath, [path.join(root, "bin", "triangulate.mjs"), "demo", "--if-empty"], { cwd: os.tmpdir(), env });
            let out = "";
            let err = "";
            child.stdout.on("data", (c) => (out += c));
            child.stderr.on("data", (c) => (err += c));
            child.on("close", (code) => resolve({ code, out, err }));
          }),
      ),
    );
    for (const r of runs) expect(r.code, r.err).toBe(0);
    expect(runs.filter((r) => /demo: loaded Quillmoor Instruments/.test(r.out))).toHaveLength(1);
    expect(query(fresh, `SELECT email FROM User WHERE email = 'organiser@quillmoor.example'`)).toHaveLength(1);
    expect(query(fresh, `SELECT id FROM Panel WHERE title = 'Year-one unit sales of the Wren-2'`)).toHaveLength(1);
  }, 120_000);

  it("refuses to load twice", async () => {
    const r = await run(["demo"]);
    expect(r.code).toBe(1);
    expect(r.err).toMatch(/already loaded/);
  });
});

describe("backup", () => {
  it("writes a consistent copy holding the same rows", async () => {
    const target = path.join(dir, "copy.db");
    const r = await run(["backup", target]);
    expect(r.code).toBe(0);
    expect(existsSync(target)).toBe(true);
    for (const table of ["User", "RosterMember", "Panel", "Question", "Round", "Invitation", "Answer", "RoundStatistic", "AuditEvent"]) {
      const sql = `SELECT * FROM "${table}" ORDER BY id`;
      expect(query(target, sql), table).toEqual(query(dbFile, sql));
    }
    expect(query(target, `SELECT id FROM Answer`).length).toBeGreaterThan(0);
  });

  it("refuses to overwrite a file and needs exactly one argument", async () => {
    const again = await run(["backup", path.join(dir, "copy.db")]);
    expect(again.code).toBe(1);
    expect(again.err).toMatch(/already exists/);
    expect((await run(["backup"])).code).toBe(2);
  });
});

describe("serve", () => {
  // Serving itself is what every app test runs against (tests/app/server-setup.ts); here only the usage.
  it("refuses a bad port or an unknown option with exit 2, before starting anything", () => {
    for (const args of [["--port", "0"], ["--port", "70000"], ["--port", "http"], ["--verbose"]]) {
      const r = runProcess(["serve", ...args]); // a process: nothing may start in it
      expect(r.code, args.join(" ")).toBe(2);
      expect(r.err).toMatch(/usage: triangulate serve/);
    }
  });
});

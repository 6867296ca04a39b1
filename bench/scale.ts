/**
 * `npm run bench:scale`: how the app behaves at an organisation's size (issue 13). Not a test:
 * it prints a table and checks nothing beyond "every request succeeded".
 *
 * For each size N × Q (default `100x10,300x30`; `-- --sizes 100x10,300x30,1000x50`), on a fresh
 * SQLite database and a fresh production server (`triangulate serve`, build in NEXT_DIST_DIR,
 * default .next-scale, built when absent or with SCALE_REBUILD=1), through the JSON API:
 * - N roster members; 3 earlier panels of 3 questions (single value, three-point, sum of parts),
 *   all N invited, one round answered by all, closed, every question's outcome recorded (part outcomes by
 *   pseudonym on the sum-of-parts one, at most 500) and the panel finished: the track records;
 * - the measured panel: Q questions (i mod 6 = 3 three-point, i mod 6 = 5 sum of parts, the rest
 *   single values: 2/3, 1/6, 1/6 at Q = 30), all N invited; round 1 answered by all (N × Q,
 *   timed), closed; round 2 revised by 60% of them (timed), closed; baselines (16 quarterly
 *   values, auto method) on questions i mod 3 = 0; outcomes recorded on i mod 3 = 2 (timed);
 *   round 3 opened, so panelists' pages show the feedback and accept answers;
 * - then, sequentially (one warm-up request each, then the median of REPS): the reviewer's
 *   report page, organiser question pages (one of each kind), the organiser panel page, a
 *   panelist's answer and feedback pages (HTML bytes, and how many of them are inline <script>
 *   data), triangulation / report.json / report.csv of a question with a baseline;
 * - an answer POST at idle, and answer POSTs sent one after another (100 ms apart) while the
 *   report page renders;
 * - the server's peak resident memory (VmHWM from /proc/<pid>/status); the log also gives the
 *   resident set and its peak after each phase, to see which phase raises it.
 *
 * Arguments: `--sizes NxQ,…`, `--reps R` (5), `--concurrency C` (answers in flight, 50).
 * SERVER_NODE_ARGS (e.g. "--cpu-prof --cpu-prof-dir=/tmp/prof") profiles the server (each page's
 * line names its CLOCK_MONOTONIC window, to cut the profile); SCALE_KEEP_DB=1 keeps each size's
 * database file (for profiling the domain services on it directly); SCALE_DUMP_DIR=<folder> writes
 * each page's last response there (to see what a page sends).
 * Traffic goes only to the loopback server this script starts; every loop is bounded.
 */
import { mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { cpus, loadavg, tmpdir } from "node:os";
import path from "node:path";
import { performance } from "node:perf_hooks";
import {
  build,
  Client,
  cpuSeconds,
  createOrganiser,
  createRoster,
  freePort,
  hasBuild,
  invite,
  migrate,
  mulberry32,
  newKey,
  organiserToken,
  percentile,
  pool,
  sessionCookie,
  startServer,
  type Panelist,
} from "../tests/harness/harness";

function arg(flag: string, fallback: string): string {
  const i = process.argv.indexOf(`--${flag}`);
  return (i >= 0 ? process.argv[i + 1] : undefined) ?? fallback;
}

const SIZES = arg("sizes", "100x10,300x30")
  .split(",")
  .map((s) => {
    const [n, q] = s.split("x").map(Number);
    if (!Number.isInteger(n) || !Number.isInteger(q) || n < 5 || n > 5000 || q < 6 || q > 50) throw new Error(`--sizes: "${s}" is not NxQ with 5 ≤ N ≤ 5000, 6 ≤ Q ≤ 50`);
    return { n, q };
  });
const REPS = Number(arg("reps", "5"));
const CONCURRENCY = Number(arg("concurrency", "50"));
const distDir = process.env.NEXT_DIST_DIR || ".next-scale";

type Kind = { answerFormat: "single" | "three-point"; aggregation: "shared" | "sum-of-parts" };
const kindOf = (i: number): Kind =>
  i % 6 === 3 ? { answerFormat: "three-point", aggregation: "shared" } : i % 6 === 5 ? { answerFormat: "single", aggregation: "sum-of-parts" } : { answerFormat: "single", aggregation: "shared" };
const hasBaseline = (i: number) => i % 3 === 0;
const hasOutcome = (i: number) => i % 3 === 2;

function questionBody(i: number, product: string) {
  const k = kindOf(i);
  return {
    text:
      k.aggregation === "sum-of-parts"
        ? `Units of the Quillmoor ${product}-${i + 1} sold in your own sales region in its first year?`
        : `Units of the Quillmoor ${product}-${i + 1} ${k.answerFormat === "three-point" ? "(low / median / high)" : ""} sold in its first year?`,
    unit: "units",
    targetPeriod: "first 12 months after launch",
    lowerBound: 0,
    // The outcome of a sum-of-parts question (the total of up to 500 parts) is held to the same
    // bounds as each part (lib/triangulation/outcome.ts checkWithinBounds), so its range covers the total.
    upperBound: k.aggregation === "sum-of-parts" ? 100_000_000 : 100_000,
    ...k,
  };
}

/** A body for panelist answers to question i (deterministic given the generator). */
function answerBody(rnd: () => number, questionId: string, i: number, round: number) {
  const centre = 2000 + 500 * i;
  const value = Math.round(centre * (round === 1 ? 0.6 + 0.8 * rnd() : 0.85 + 0.3 * rnd()));
  const three = kindOf(i).answerFormat === "three-point" ? { low: Math.round(value * 0.7), high: Math.round(value * 1.4) } : {};
  return {
    questionId,
    value,
    ...three,
    rationale: `Round ${round}: distributor orders for the Quillmoor range and last year's channel mix point to about ${value} units.`,
  };
}

interface Timed {
  readonly status: number;
  readonly ms: number;
}

/**
 * Requests sent one at a time go on a new connection (`connection: close`): a pooled socket left
 * idle could be closed by the server (keep-alive timeout) just as it is reused.
 */
const FRESH = { connection: "close" };

/**
 * One answer. A connection lost before the reply (a pooled socket the server closed as it idled,
 * which a busy shared machine makes likelier) is retried with the same Idempotency-Key, which
 * stores the answer at most once; at most 3 tries.
 */
async function postAnswer(c: Client, p: Panelist, body: unknown, headers: Record<string, string> = {}): Promise<Timed> {
  const key = newKey();
  for (let tries = 0; tries < 3; tries++) {
    try {
      const r = await c.request("POST", "/api/v1/panelist/answers", { token: p.token, headers: { ...headers, "idempotency-key": key }, body, timeoutMs: 120_000 });
      // A retry of a stored answer is replayed with 200: count it as stored.
      return { status: tries > 0 && r.status === 200 ? 201 : r.status, ms: r.ms };
    } catch {
      // connection lost: try again
    }
  }
  return { status: 0, ms: 0 };
}

const median = (xs: readonly number[]) => percentile(xs, 50);
const fmtMs = (ms: number) => (ms >= 1000 ? `${(ms / 1000).toFixed(2)} s` : `${ms.toFixed(ms < 10 ? 1 : 0)} ms`);
const fmtBytes = (b: number) => (b >= 1e6 ? `${(b / 1e6).toFixed(2)} MB` : `${(b / 1e3).toFixed(0)} kB`);

/** Bytes inside inline <script> elements (the framework's embedded page data). */
function scriptBytes(html: string): number {
  let n = 0;
  for (const m of html.matchAll(/<script\b[^>]*>([\s\S]*?)<\/script>/g)) n += Buffer.byteLength(m[1]);
  return n;
}

/** VmHWM (peak resident set) of a process, or with `field` another line of /proc/<pid>/status, in bytes (Linux); NaN elsewhere. */
function peakRss(pid: number | undefined, field = "VmHWM"): number {
  try {
    const m = new RegExp(`${field}:\\s+(\\d+) kB`).exec(readFileSync(`/proc/${pid}/status`, "utf8"));
    return m ? Number(m[1]) * 1024 : Number.NaN;
  } catch {
    return Number.NaN;
  }
}

/**
 * With SCALE_HEAP_SNAPSHOT=1 and SERVER_NODE_ARGS="--heapsnapshot-signal=SIGUSR2 --diagnostic-dir=<folder>":
 * the server writes a heap snapshot of its request thread into <folder> before it stops (what holds its memory).
 */
async function heapSnapshot(pid: number | undefined, baseURL: string): Promise<void> {
  const dir = /--diagnostic-dir=(\S+)/.exec(process.env.SERVER_NODE_ARGS ?? "")?.[1];
  if (!pid || !dir) throw new Error("SCALE_HEAP_SNAPSHOT=1 needs SERVER_NODE_ARGS with --heapsnapshot-signal=SIGUSR2 --diagnostic-dir=<folder>");
  const files = () => readdirSync(dir).filter((f) => f.endsWith(".heapsnapshot"));
  const before = files().length;
  process.kill(pid, "SIGUSR2");
  // Bounded: at most 5 minutes for the snapshot to be written (the file appears once complete).
  for (let k = 0; k < 600 && files().length === before; k++) await new Promise((res) => setTimeout(res, 500));
  // The file appears as the writing starts, which blocks the server's request thread: a request answered means it is done.
  await fetch(`${baseURL}/api/v1/rule-defaults`, { headers: FRESH });
  console.log(`heap snapshot: ${files().at(-1) ?? "none written"} in ${dir}`);
}

const load = () => loadavg().map((x) => x.toFixed(2)).join(" ");
const mib = (bytes: number) => `${(bytes / 2 ** 20).toFixed(0)} MiB`;
/** The server's resident set now and at its peak so far, for the log (where the memory goes). */
const memory = (pid: number | undefined) => `server RSS ${mib(peakRss(pid, "VmRSS"))}, peak ${mib(peakRss(pid))}`;

/** One row's cell: its text and the number the growth column compares. */
type Cell = { text: string; value: number };
type Column = Map<string, Cell>;

async function measureSize(n: number, q: number): Promise<Column> {
  const col: Column = new Map();
  const put = (label: string, text: string, value: number) => col.set(label, { text, value });
  const dir = mkdtempSync(path.join(tmpdir(), "triangulate-scale-"));
  const databaseUrl = `file:${path.join(dir, "scale.db")}`;
  migrate({ databaseUrl, port: 0, distDir });
  const server = await startServer({ databaseUrl, port: await freePort(), distDir });
  const c = new Client(server.baseURL, CONCURRENCY + 4);
  const rnd = mulberry32(20261202);
  try {
    console.log(`\n== ${n} × ${q}: server ${server.baseURL} (pid ${server.child.pid}), build ${distDir}, load average ${load()}`);
    const organiser = createOrganiser(databaseUrl);
    const reviewer = createOrganiser(databaseUrl, "reviewer");
    const token = await organiserToken(server.baseURL, organiser);
    const organiserCookie = await sessionCookie(server.baseURL, organiser);
    const reviewerCookie = await sessionCookie(server.baseURL, reviewer);
    const api = (method: string, p: string, body: unknown = {}) => c.ok(method, p, { token, body: method === "GET" ? undefined : body });
    const t0 = performance.now();
    const memberIds = await createRoster(c, token, n);

    const serverCpu = () => cpuSeconds(server.child.pid);
    const answerAll = async (questions: readonly { id: string }[], who: readonly Panelist[], round: number): Promise<{ out: Timed[]; seconds: number; cpu: number }> => {
      const bodies = who.flatMap((p) => questions.map((qq, i) => ({ p, body: answerBody(rnd, qq.id, i, round) })));
      const t = performance.now();
      const cpu0 = serverCpu();
      const out = await pool(bodies, CONCURRENCY, (a) => postAnswer(c, a.p, a.body));
      const cpu = serverCpu() - cpu0;
      const bad = out.filter((o) => o.status !== 201);
      if (bad.length > 0) throw new Error(`round ${round}: ${bad.length} answers not stored (statuses ${[...new Set(bad.map((b) => b.status))].join(", ")})`);
      return { out, seconds: (performance.now() - t) / 1000, cpu };
    };
    const recordOutcome = async (panelId: string, question: { id: string }, i: number, round: number): Promise<number> => {
      let parts: { pseudonym: string; outcomeValue: number }[] = [];
      if (kindOf(i).aggregation === "sum-of-parts") {
        const answers = await api("GET", `/api/v1/panels/${panelId}/rounds/${round}/answers`);
        const mine = answers.questions.find((x: { questionId: string }) => x.questionId === question.id);
        const pseudonyms = [...new Set<string>(mine.answers.map((a: { pseudonym: string }) => a.pseudonym))].slice(0, 500);
        parts = pseudonyms.map((pseudonym) => ({ pseudonym, outcomeValue: Math.round((2000 + 500 * i) * (0.8 + 0.4 * rnd())) }));
      }
      const outcomeValue = parts.length > 0 ? parts.reduce((s, p) => s + p.outcomeValue, 0) : Math.round((2000 + 500 * i) * (0.9 + 0.2 * rnd()));
      const r = await c.request("POST", `/api/v1/panels/${panelId}/questions/${question.id}/outcome`, { token, body: { outcomeValue, note: "Quillmoor shipment ledger", parts } });
      if (r.status !== 201 && r.status !== 200) throw new Error(`outcome → ${r.status}: ${JSON.stringify(r.body)}`);
      return r.ms;
    };

    // Three earlier panels with outcomes: the track records the measured panel's reports use.
    for (let e = 0; e < 3; e++) {
      const panel = await api("POST", "/api/v1/panels", {
        title: `Quillmoor QE-${e + 1} gauge launch`,
        questions: [0, 3, 5].map((i) => questionBody(i, `QE${e + 1}`)),
      });
      const who = await invite(c, token, panel.id, memberIds);
      await api("POST", `/api/v1/panels/${panel.id}/rounds/1/open`);
      const qs = panel.questions as { id: string }[];
      // answerBody indexes by position; map positions 0,1,2 to kinds 0,3,5.
      const bodies = who.flatMap((p) => qs.map((qq, k) => ({ p, body: answerBody(rnd, qq.id, [0, 3, 5][k], 1) })));
      const out = await pool(bodies, CONCURRENCY, (a) => postAnswer(c, a.p, a.body));
      const bad = out.filter((o) => o.status !== 201);
      if (bad.length > 0) throw new Error(`earlier panel ${e + 1}: ${bad.length} answers not stored (statuses ${[...new Set(bad.map((b) => b.status))].join(", ")})`);
      await api("POST", `/api/v1/panels/${panel.id}/rounds/1/close`);
      for (let k = 0; k < qs.length; k++) await recordOutcome(panel.id, qs[k], [0, 3, 5][k], 1);
      await api("POST", `/api/v1/panels/${panel.id}/finish`);
    }

    // The measured panel.
    const panel = await api("POST", "/api/v1/panels", {
      title: "Quillmoor QF field sensor family, year-one units",
      description: "Year-one unit sales of the Quillmoor QF field sensor family, by model.",
      questions: Array.from({ length: q }, (_, i) => questionBody(i, "QF")),
    });
    const questions = panel.questions as { id: string }[];
    const panelists = await invite(c, token, panel.id, memberIds);
    await api("POST", `/api/v1/panels/${panel.id}/shares`, { email: reviewer.email, role: "reviewer" });
    await api("POST", `/api/v1/panels/${panel.id}/rounds/1/open`);
    console.log(`setup (roster, 3 earlier panels with outcomes, panel, invitations): ${((performance.now() - t0) / 1000).toFixed(1)} s; ${memory(server.child.pid)}`);

    const throughput = (label: string, r: { out: Timed[]; seconds: number; cpu: number }) => {
      const ms = r.out.map((o) => o.ms);
      const rate = r.out.length / r.seconds;
      const cpuEach = (1000 * r.cpu) / r.out.length;
      put(label, `${rate.toFixed(0)}/s, p50 ${fmtMs(percentile(ms, 50))}, p99 ${fmtMs(percentile(ms, 99))} (${r.out.length})`, percentile(ms, 99));
      put(`${label}: server CPU per answer`, `${cpuEach.toFixed(2)} ms`, cpuEach);
      console.log(`${label}: ${r.out.length} in ${r.seconds.toFixed(1)} s, load average ${load()}; ${memory(server.child.pid)}`);
    };
    throughput("round-1 answers", await answerAll(questions, panelists, 1));
    let t = performance.now();
    await api("POST", `/api/v1/panels/${panel.id}/rounds/1/close`);
    put("closing round 1", fmtMs(performance.now() - t), performance.now() - t);
    await api("POST", `/api/v1/panels/${panel.id}/rounds`, { open: true });
    const revisers = panelists.filter((_, k) => k % 5 < 3);
    throughput("round-2 answers (60% revise)", await answerAll(questions, revisers, 2));
    await api("POST", `/api/v1/panels/${panel.id}/rounds/2/close`);

    const history = Array.from({ length: 16 }, (_, k) => Math.round(1000 + 60 * k + 200 * Math.sin((k * Math.PI) / 2) + 50 * rnd()));
    t = performance.now();
    for (let i = 0; i < q; i++) if (hasBaseline(i)) await api("PUT", `/api/v1/panels/${panel.id}/questions/${questions[i].id}/baseline`, { values: history, season: 4, horizon: 4 });
    console.log(`baselines on ${questions.filter((_, i) => hasBaseline(i)).length} questions: ${((performance.now() - t) / 1000).toFixed(1)} s; ${memory(server.child.pid)}`);
    const outcomeMs: number[] = [];
    for (let i = 0; i < q; i++) if (hasOutcome(i)) outcomeMs.push(await recordOutcome(panel.id, questions[i], i, 2));
    put("recording an outcome", `${fmtMs(median(outcomeMs))} (median of ${outcomeMs.length})`, median(outcomeMs));
    await api("POST", `/api/v1/panels/${panel.id}/rounds`, { open: true });

    // Pages and reads, one after another: a warm-up request, then the median of REPS.
    const page = async (label: string, urlPath: string, auth: { cookie?: string; token?: string }) => {
      const times: number[] = [];
      let html = "";
      // CLOCK_MONOTONIC in µs, the clock of V8's CPU profiles: slices a server profile per page.
      const from = process.hrtime.bigint() / 1000n;
      let cpu0 = 0;
      for (let r = 0; r <= REPS; r++) {
        if (r === 1) cpu0 = serverCpu();
        const res = await c.request("GET", urlPath, { ...auth, headers: FRESH, timeoutMs: 300_000 });
        if (res.status !== 200) throw new Error(`GET ${urlPath} → ${res.status}`);
        if (r > 0) times.push(res.ms);
        html = typeof res.body === "string" ? res.body : JSON.stringify(res.body);
      }
      const bytes = Buffer.byteLength(html);
      if (process.env.SCALE_DUMP_DIR) writeFileSync(path.join(process.env.SCALE_DUMP_DIR, `${n}x${q}-${label.replace(/[^a-z0-9]+/gi, "-")}.html`), html);
      const script = /^\s*<(!DOCTYPE|html)/i.test(html) ? `, script data ${fmtBytes(scriptBytes(html))}` : "";
      const cpuEach = (1000 * (serverCpu() - cpu0)) / REPS;
      put(label, `${fmtMs(median(times))}, ${fmtBytes(bytes)}${script}; CPU ${fmtMs(cpuEach)}`, median(times));
      console.log(`${label}: ${times.map((x) => x.toFixed(0)).join(" ")} ms, server CPU ${cpuEach.toFixed(0)} ms each (monotonic µs ${from}–${process.hrtime.bigint() / 1000n}); ${memory(server.child.pid)}`);
    };
    const reportPath = `/reports/${panel.id}`;
    await page("reviewer report page", reportPath, { cookie: reviewerCookie });
    for (const i of [0, 3, 5]) {
      const k = kindOf(i);
      const what = `${k.aggregation === "sum-of-parts" ? "sum of parts" : k.answerFormat}${hasBaseline(i) ? ", baseline" : ""}${hasOutcome(i) ? ", outcome" : ""}`;
      await page(`organiser question page (${what})`, `/panels/${panel.id}/questions/${questions[i].id}`, { cookie: organiserCookie });
    }
    await page("organiser panel page", `/panels/${panel.id}`, { cookie: organiserCookie });
    const phone = revisers[0];
    await page("panelist answer page", `/p/${phone.token}`, {});
    await page("panelist feedback page", `/p/${phone.token}/feedback`, {});
    const qb = `/api/v1/panels/${panel.id}/questions/${questions[0].id}`;
    await page("triangulation (API)", `${qb}/triangulation`, { token });
    await page("report.json", `${qb}/report.json`, { token });
    await page("report.csv", `${qb}/report.csv`, { token });

    // An answer POST at idle, and while the report page renders.
    const round3 = panelists.filter((_, k) => k % 5 >= 3);
    let next = 0;
    const oneAnswer = () => postAnswer(c, round3[next++ % round3.length], answerBody(rnd, questions[0].id, 0, 3), FRESH);
    const idle: number[] = [];
    for (let r = 0; r < 10; r++) idle.push((await oneAnswer()).ms);
    const during: number[] = [];
    for (let r = 0; r < Math.max(1, Math.min(REPS, 3)); r++) {
      let rendering = true;
      // Settled (never rejected) at once, so a failure waits for the await below instead of going unhandled.
      const report = c.request("GET", reportPath, { cookie: reviewerCookie, headers: FRESH, timeoutMs: 300_000 }).then(
        (r) => ((rendering = false), r.status === 200 ? null : new Error(`report page → ${r.status}`)),
        (e: unknown) => ((rendering = false), e),
      );
      // Bounded: stops when the report arrives (or times out), at most 3,000 POSTs.
      for (let k = 0; rendering && k < 3000; k++) {
        await new Promise((res) => setTimeout(res, 100));
        if (!rendering) break;
        const a = await oneAnswer();
        if (a.status !== 201) throw new Error(`answer during the report → ${a.status}`);
        during.push(a.ms);
      }
      const failed = await report;
      if (failed) throw failed;
    }
    put("answer POST, idle", `${fmtMs(median(idle))} median, max ${fmtMs(Math.max(...idle))}`, median(idle));
    put(
      "answer POST while the report renders",
      during.length ? `${fmtMs(median(during))} median, max ${fmtMs(Math.max(...during))} (${during.length})` : "report done within 100 ms",
      during.length ? Math.max(...during) : 0,
    );
    const rss = peakRss(server.child.pid);
    put("server peak RSS (VmHWM)", `${(rss / 2 ** 20).toFixed(0)} MiB`, rss);
    console.log(`done ${n} × ${q}: load average ${load()}`);
    if (process.env.SCALE_HEAP_SNAPSHOT === "1") await heapSnapshot(server.child.pid, server.baseURL);
  } finally {
    c.close();
    await server.stop();
    if (process.env.SCALE_KEEP_DB === "1") console.log(`database kept: ${databaseUrl}`);
    else rmSync(dir, { recursive: true, force: true });
  }
  return col;
}

async function main(): Promise<void> {
  if (process.env.SCALE_REBUILD === "1" || !hasBuild(distDir)) {
    console.log(`building into ${distDir} …`);
    build(distDir);
  }
  console.log(`machine: ${cpus().length} cores (${cpus()[0]?.model ?? "?"}), load average ${load()}; sizes ${SIZES.map((s) => `${s.n}x${s.q}`).join(", ")}; ${REPS} repetitions; ${CONCURRENCY} answers in flight`);
  const columns: Column[] = [];
  for (const s of SIZES) columns.push(await measureSize(s.n, s.q));
  const labels = [...columns[0].keys()];
  const heads = ["what", ...SIZES.map((s) => `${s.n} × ${s.q}`), ...(SIZES.length > 1 ? [`last / first (answers ×${((SIZES.at(-1)!.n * SIZES.at(-1)!.q) / (SIZES[0].n * SIZES[0].q)).toFixed(0)})`] : [])];
  const rows = labels.map((l) => {
    const cells = columns.map((col) => col.get(l));
    const first = cells[0]?.value ?? Number.NaN;
    const last = cells.at(-1)?.value ?? Number.NaN;
    return [l, ...cells.map((x) => x?.text ?? "—"), ...(SIZES.length > 1 ? [first > 0 ? `${(last / first).toFixed(1)}×` : "—"] : [])];
  });
  console.log(`\n| ${heads.join(" | ")} |\n|${heads.map(() => "---").join("|")}|`);
  for (const r of rows) console.log(`| ${r.join(" | ")} |`);
  console.log(`\nload average at the end: ${load()}`);
}

main().then(
  () => process.exit(0),
  (err) => {
    console.error(err);
    process.exit(1);
  },
);

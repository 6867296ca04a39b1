/**
 * What the browser tests share: Debian's Chromium started headless, signing in through the real
 * sign-in page, and reading a figure a page exposes as `data-stat`/`data-value`.
 */
import { readFileSync } from "node:fs";
import path from "node:path";
import { chromium, type Browser, type BrowserContext, type Page } from "playwright-core";
import { expect } from "vitest";
import { baseURL, type TestUser } from "./api-client";

const LAUNCH_ARGS = ["--no-sandbox", "--disable-gpu", "--disable-background-networking", "--disable-component-update", "--no-first-run"];

/** Debian's Chromium (/usr/bin/chromium), headless. */
export function launchChromium(): Promise<Browser> {
  return chromium.launch({ executablePath: "/usr/bin/chromium", args: LAUNCH_ARGS });
}

/**
 * Signs in on a new page and waits for the user's home page: /panels for an organiser; /reports
 * for a reviewer, who reaches it through a redirect from /panels (waiting for the final page keeps
 * that redirect from landing after the test's next navigation).
 */
export async function signInPage(ctx: BrowserContext, user: TestUser, home: "/panels" | "/reports" = "/panels", origin = baseURL): Promise<Page> {
  const page = await ctx.newPage();
  page.on("dialog", (d) => void d.accept());
  await page.goto(`${origin}/sign-in`);
  await page.getByLabel("E-mail").fill(user.email);
  await page.getByLabel("Password").fill(user.password);
  await page.getByRole("button", { name: "Sign in" }).click();
  await page.waitForURL((u) => u.pathname === home);
  return page;
}

/** The number a page shows as `[data-stat=name]` (its `data-value`). @throws when it has none. */
export async function stat(scope: Page | ReturnType<Page["locator"]>, name: string): Promise<number> {
  const raw = await scope.locator(`[data-stat="${name}"]`).first().getAttribute("data-value");
  if (raw === null || raw === "") throw new Error(`no value for ${name}`);
  return Number(raw);
}

const AXE_SOURCE = readFileSync(path.join(process.cwd(), "node_modules/axe-core/axe.min.js"), "utf8");

/**
 * Runs axe-core (node_modules/axe-core/axe.min.js, injected into the page) over the page as it
 * stands and returns its violations as one readable line each: rule id, impact, the selectors of
 * the offending nodes. An empty list means axe found nothing (WCAG 2.x A/AA and best-practice
 * rules, axe's defaults).
 */
export async function axeViolations(page: Page): Promise<string[]> {
  if (!(await page.evaluate(() => "axe" in window))) await page.addScriptTag({ content: AXE_SOURCE });
  const found = await page.evaluate(async () => {
    const axe = (window as unknown as { axe: { run: (ctx: Document) => Promise<{ violations: { id: string; impact: string | null; nodes: { target: unknown[] }[] }[] }> } }).axe;
    const result = await axe.run(document);
    return result.violations.map((v) => ({ id: v.id, impact: v.impact, targets: v.nodes.map((n) => n.target.map(String).join(" ")) }));
  });
  const where = new URL(page.url()).pathname;
  return found.map((v) => `${where}: ${v.id} (${v.impact ?? "no impact"}) at ${v.targets.join(", ")}`);
}

/**
 * Expects axe to find no violation on the page as it stands (a soft expectation: the test goes on
 * and fails at its end, listing every violation of every page state it visited).
 */
export async function expectAccessible(page: Page): Promise<void> {
  // After a server action the page's metadata streams in again: wait for its title first (a page
  // without one still fails here, on this poll).
  await expect.poll(() => page.title(), { message: `the title of ${page.url()}` }).not.toBe("");
  // A page still streaming in shows the loading state (app/loading.tsx), not the page: check the page.
  await expect.poll(() => page.locator("[data-loading]").count(), { message: `the loading state of ${page.url()} to end` }).toBe(0);
  expect.soft(await axeViolations(page), `axe-core on ${page.url()}`).toEqual([]);
}

/** The two widths every page is looked at: a desktop and a small phone. */
export const WIDTHS = [1280, 360] as const;

/**
 * Looks at the page as it stands at each of `WIDTHS`: checks it with axe (`expectAccessible`) and
 * saves a full-page screenshot as `<dir>/<name>-<width>.png`; then puts the viewport back.
 */
export async function captureWidths(page: Page, dir: string, name: string): Promise<void> {
  const before = page.viewportSize();
  try {
    for (const width of WIDTHS) {
      await page.setViewportSize({ width, height: 900 });
      await expectAccessible(page);
      await page.screenshot({ path: path.join(dir, `${name}-${width}.png`), fullPage: true });
    }
  } finally {
    if (before) await page.setViewportSize(before);
  }
}

/**
 * The compressed size of the JavaScript a page load fetches: the sum over the script responses of
 * their bodies as sent over the network (after Content-Encoding, Chromium's encoded body size),
 * counted from `load()` until the page's network is idle.
 */
export async function scriptBytes(page: Page, load: () => Promise<unknown>): Promise<{ bytes: number; files: number; encodings: string[]; largest: string[] }> {
  const sizes: Promise<[number, string, string]>[] = [];
  const onFinished = (req: import("playwright-core").Request) => {
    if (req.resourceType() !== "script") return;
    sizes.push(Promise.all([req.sizes(), req.response()]).then(async ([s, res]) => [s.responseBodySize, (await res?.headerValue("content-encoding")) ?? "none", new URL(req.url()).pathname]));
  };
  page.on("requestfinished", onFinished);
  try {
    await load();
    await page.waitForLoadState("networkidle");
  } finally {
    page.off("requestfinished", onFinished);
  }
  const all = await Promise.all(sizes);
  return { bytes: all.reduce((a, [b]) => a + b, 0), files: all.length, encodings: [...new Set(all.map(([, e]) => e))], largest: [...all].sort((a, b) => b[0] - a[0]).map(([b, , u]) => `${u.split("/").pop()} ${(b / 1000).toFixed(1)} kB`) };
}

/**
 * The outermost elements that reach past the right edge of the viewport (tag, id or class, and
 * their right edge in px), to say what makes a page scroll sideways.
 */
export function overflowing(page: Page): Promise<string[]> {
  return page.evaluate(() => {
    const width = document.documentElement.clientWidth;
    const out: string[] = [];
    for (const el of Array.from(document.body.querySelectorAll("*"))) {
      const right = el.getBoundingClientRect().right;
      const parent = el.parentElement;
      if (right > width + 0.5 && (!parent || parent.getBoundingClientRect().right <= width + 0.5)) {
        const name = `${el.tagName.toLowerCase()}${el.id ? `#${el.id}` : ""}${el.classList.length ? `.${Array.from(el.classList).join(".")}` : ""}`;
        out.push(`${name} (right edge ${Math.round(right)} px)`);
      }
    }
    return out;
  });
}

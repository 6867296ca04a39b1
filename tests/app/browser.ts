/**
 * What the browser tests share: Debian's Chromium started headless, signing in through the real
 * sign-in page, and reading a figure a page exposes as `data-stat`/`data-value`.
 */
import { chromium, type Browser, type BrowserContext, type Page } from "playwright-core";
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
export async function signInPage(ctx: BrowserContext, user: TestUser, home: "/panels" | "/reports" = "/panels"): Promise<Page> {
  const page = await ctx.newPage();
  page.on("dialog", (d) => void d.accept());
  await page.goto(`${baseURL}/sign-in`);
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

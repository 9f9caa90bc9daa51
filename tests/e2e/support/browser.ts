import { mkdirSync } from "node:fs";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { chromium, type Browser, type BrowserContext, type Page } from "playwright-core";

export const ARTIFACTS = fileURLToPath(new URL("../.artifacts", import.meta.url));

export async function launchBrowser(): Promise<Browser> {
  return chromium.launch({
    executablePath: "/usr/bin/chromium",
    headless: true,
    args: [
      "--no-sandbox",
      "--disable-gpu",
      "--disable-quic",
      "--no-first-run",
      "--disable-background-networking",
      "--disable-component-update",
      "--disable-sync",
      "--use-angle=swiftshader",
      "--enable-unsafe-swiftshader",
    ],
  });
}

export type Session = { context: BrowserContext; page: Page; problems: string[] };

/**
 * A fresh context (own cookies) at a laptop's size. Page errors and failed API calls
 * are collected, so a test can assert that the page stayed clean.
 */
export async function openSession(browser: Browser, baseURL: string): Promise<Session> {
  const context = await browser.newContext({ baseURL, viewport: { width: 1440, height: 900 }, deviceScaleFactor: 1 });
  const page = await context.newPage();
  const problems: string[] = [];
  page.on("pageerror", (error) => problems.push(`page error: ${error.message}`));
  page.on("console", (message) => {
    if (message.type() === "error") problems.push(`console error: ${message.text()}`);
  });
  // generous: `npm test` runs the browser files beside the other projects on a 2-core machine
  page.setDefaultTimeout(30_000);
  return { context, page, problems };
}

export const DEMO_PASSWORD = "orthostack-demo";

export async function signIn(page: Page, email: string, password = DEMO_PASSWORD) {
  await page.goto("/sign-in");
  await page.getByLabel("E-mail address").fill(email);
  await page.getByLabel("Password").fill(password);
  await page.getByRole("button", { name: "Sign in", exact: true }).click();
}

/**
 * Signs in and waits for the role's start page: staff land on what waits for them (`/`), a
 * supplier on its reports. Staff then go on to the project list, where most tests begin.
 */
export async function signInAs(page: Page, email: string) {
  await signIn(page, email);
  await page.waitForURL((url) => url.pathname === "/" || url.pathname === "/reports");
  await page.getByRole("navigation", { name: "Main" }).waitFor();
  if (new URL(page.url()).pathname === "/") {
    await page.getByRole("heading", { name: "Waiting for you" }).waitFor();
    await openProjects(page);
  }
}

/** The project list through the navigation. */
export async function openProjects(page: Page) {
  await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Projects" }).click();
  await page.waitForURL((url) => url.pathname === "/projects");
  await page.getByRole("table", { name: "Projects" }).waitFor();
}

/**
 * Full-page pictures of the screens for people to look at (tests/e2e/.artifacts/), taken only
 * when E2E_SCREENSHOTS=1 (`npm run test:screenshots`): nothing asserts on them, and rendering
 * some sixty full pages costs CI minutes. Files that check pixels take their own pictures.
 */
export async function screenshot(page: Page, name: string) {
  if (process.env.E2E_SCREENSHOTS !== "1") return;
  mkdirSync(ARTIFACTS, { recursive: true });
  // Park the pointer on empty page space so no hover state is in the picture.
  await page.mouse.move(page.viewportSize()!.width - 4, page.viewportSize()!.height - 4);
  // Let web fonts settle so the picture shows Manrope, not a fallback.
  await page.evaluate(() => document.fonts.ready);
  await page.screenshot({ path: join(ARTIFACTS, `${name}.png`), fullPage: true });
}

/** The labels of the main navigation, in order. */
export async function navLabels(page: Page): Promise<string[]> {
  const nav = page.getByRole("navigation", { name: "Main" });
  await nav.waitFor();
  const links = await nav.getByRole("link").allInnerTexts();
  return links.map((t) => t.split("\n")[0].trim());
}

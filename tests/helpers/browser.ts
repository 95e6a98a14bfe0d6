// Headless Chromium for end-to-end tests: the Debian browser through playwright-core
// (no browser download), and a sign-in through the real /signin form.
import { mkdirSync } from "node:fs";
import path from "node:path";
import { chromium, type Browser, type Page } from "playwright-core";
import { DEMO_PASSWORD } from "@/lib/demo/accounts";

export const CHROMIUM_PATH = process.env.CHROMIUM_PATH || "/usr/bin/chromium";

export const SCREENSHOT_DIR = path.resolve(__dirname, "../../test-output/screenshots");

export async function launchBrowser(): Promise<Browser> {
  return chromium.launch({
    executablePath: CHROMIUM_PATH,
    headless: true,
    args: [
      "--no-sandbox",
      "--disable-gpu",
      "--disable-quic",
      "--no-first-run",
      "--disable-background-networking",
      "--disable-component-update",
      "--disable-sync",
    ],
  });
}

/**
 * Sign in through the sign-in form as a user would (demo password unless given) and wait for
 * the signed-in landing page. Throws with the page's alert text if sign-in fails.
 */
export async function signInPage(
  page: Page,
  url: string,
  email: string,
  password: string = DEMO_PASSWORD,
): Promise<void> {
  await page.goto(`${url}/signin`);
  await page.locator("#email").fill(email);
  await page.locator("#password").fill(password);
  await Promise.all([
    page
      .waitForURL((u) => !u.pathname.startsWith("/signin"), { timeout: 30_000 })
      .catch(async (err) => {
        // Next renders an empty role=alert route announcer; the form's own alert is the one to read.
        const alert = await page
          .locator("form [role=alert]")
          .first()
          .textContent({ timeout: 1000 })
          .catch(() => null);
        throw new Error(`sign-in as ${email} failed${alert ? `: ${alert}` : ""} (${String(err)})`);
      }),
    page.getByRole("button", { name: "Sign in", exact: true }).click(),
  ]);
}

/** Save a full-page screenshot under test-output/screenshots/<name>.png and return its path. */
export async function screenshot(page: Page, name: string): Promise<string> {
  mkdirSync(SCREENSHOT_DIR, { recursive: true });
  const file = path.join(SCREENSHOT_DIR, `${name}.png`);
  await page.screenshot({ path: file, fullPage: true });
  return file;
}

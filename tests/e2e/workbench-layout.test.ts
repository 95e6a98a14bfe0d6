// End to end in real Chromium: every Workbench panel at phone width, 1280 px and 1680 px, with a
// screenshot of each (test-output/screenshots/layout-*.png) and a check that no label or value
// is cut off (an ellipsis or a clipped box: the element's text is wider than its box).
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import { mkdirSync } from "node:fs";
import path from "node:path";
import { launchBrowser, signInPage, SCREENSHOT_DIR } from "../helpers/browser";
import { signIn, startServer, type TestServer } from "../helpers/server";
import { clipped, cutSelects, spillsOut } from "./layout-probes";

const DESIGNER = "designer@fjordline.example";
const PASSWORD = "railwise-demo";

let server: TestServer;
let browser: Browser;
const scenarios: { id: string; name: string }[] = [];

beforeAll(async () => {
  server = await startServer();
  browser = await launchBrowser();
  const api = await signIn(server.url, DESIGNER, PASSWORD);
  const boards = (await (await api.fetch("/api/boards")).json()) as { items: { id: string }[] };
  for (const b of boards.items) {
    const list = (await (await api.fetch(`/api/scenarios?boardId=${b.id}`)).json()) as {
      items: { id: string; name: string }[];
    };
    scenarios.push(...list.items.map((s) => ({ id: s.id, name: s.name })));
  }
  mkdirSync(SCREENSHOT_DIR, { recursive: true });
});

afterAll(async () => {
  await browser?.close();
  await server?.stop();
});

async function shot(page: Page, name: string, selector: string) {
  const el = page.locator(selector).first();
  if ((await el.count()) === 0) return;
  await el.scrollIntoViewIfNeeded();
  await el.screenshot({ path: path.join(SCREENSHOT_DIR, `layout-${name}.png`) });
}

const WIDTHS = [390, 1280, 1680];

describe("workbench panels at three widths", () => {
  for (const width of WIDTHS) {
    it(`shows every panel without cut-off labels or values at ${width} px`, async () => {
      const ctx = await browser.newContext({ viewport: { width, height: 900 } });
      const page = await ctx.newPage();
      const problems: string[] = [];
      try {
        await signInPage(page, server.url, DESIGNER);
        for (const re of [/battery/i, /hydrophone/i, /blinker/i]) {
          const s = scenarios.find((x) => re.test(x.name));
          expect(s, `demo scenario ${re}`).toBeTruthy();
          const tag = `${re.source.replace(/\W/g, "")}-${width}`;
          await page.goto(`${server.url}/scenarios/${s!.id}`);
          await page.getByTestId("run-button").waitFor();
          await expect
            .poll(() => page.getByTestId("run-status").textContent(), { timeout: 30_000 })
            .toMatch(/Solver ready/);
          await page.getByTestId("run-button").click();
          await expect
            .poll(() => page.getByTestId("run-status").textContent(), { timeout: 60_000 })
            .toMatch(/^Done in/);
          await page.waitForTimeout(500);
          if (re.source === "battery") {
            // A saved run, so the Runs table has a row to show.
            await page.getByTestId("save-run-button").click();
            await page.getByTestId("runs-table").waitFor({ timeout: 60_000 });
          }
          for (const tab of ["Stage", "Signal", "From spec"]) {
            await page.getByRole("tab", { name: tab, exact: true }).first().click();
            if (tab === "From spec") {
              await page.getByTestId("design-button").click();
              await page.waitForTimeout(300);
            }
            await shot(page, `${tag}-editor-${tab.replace(" ", "").toLowerCase()}`, "section[aria-label=Editor]");
            problems.push(...(await clipped(page, "section[aria-label=Editor]")).map((p) => `${tag} ${tab}: ${p}`));
            problems.push(...(await cutSelects(page, "section[aria-label=Editor]")).map((p) => `${tag} ${tab}: ${p}`));
          }
          await shot(page, `${tag}-runbar`, "[data-testid=run-bar]");
          for (const [name, sel] of [
            ["trace", "section:has(h2:text-is('Trace'))"],
            ["loop", "section:has(h2:text-is('Loop'))"],
            ["readings", "section:has(h2:text-is('Readings'))"],
            ["studies", "section:has(h2:text-is('Studies'))"],
            ["runs", "section:has(h2:text-is('Runs'))"],
            ["history", "section:has(h2:text-is('History'))"],
          ] as const) {
            await shot(page, `${tag}-${name}`, sel);
            // Scrolled into view, so its layout is done (the lower panels skip it offscreen).
            problems.push(...(await spillsOut(page, sel)).map((p) => `${tag} ${name}: ${p}`));
          }
          // The tolerance form too: its spec-window labels are the longest of the studies.
          await page.getByTestId("studies-card").getByRole("tab", { name: "Tolerance spread" }).click();
          await shot(page, `${tag}-studies-tolerance`, "[data-testid=studies-card]");
          problems.push(...(await cutSelects(page, "[data-testid=studies-card]")).map((p) => `${tag} studies: ${p}`));
          problems.push(...(await clipped(page, "[data-testid=workbench]")).map((p) => `${tag}: ${p}`));
          if (width < 640) {
            // No keyboard-shortcut hint on a phone.
            expect(await page.locator("[data-testid=run-button] kbd").isVisible()).toBe(false);
          }
        }
      } finally {
        await ctx.close();
      }
      const unique = Array.from(new Set(problems));
      console.log(
        `[layout] ${width} px: ${unique.length} cut-off text element(s)${unique.length ? "\n  " + unique.join("\n  ") : ""}`,
      );
      expect(unique).toEqual([]);
    });
  }
});

// End to end in real Chromium: the Workbench from a designer's and a viewer's seat.
// Checks come from the product contract (lib/schemas/README.md) and from the closed-form Schmitt-trigger
// thresholds of tests/REFERENCES.md ("Comparator with positive feedback", inverting form, [derived;
// textbook standard, e.g. Sedra & Smith]).
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, BrowserContext, Page } from "playwright-core";
import { launchBrowser, screenshot, signInPage, SCREENSHOT_DIR } from "../helpers/browser";
import { signIn, startServer, type TestServer } from "../helpers/server";
import path from "node:path";
import { mkdirSync } from "node:fs";

// Gross-regression bounds for timing figures measured on a shared machine; the product targets
// (first plot ≤ 1 s, no main-thread task over 100 ms) are printed by the tests, and the
// performance figures proper come from `npm run bench`.
const GROSS_FIRST_PLOT_MS = 3000;
const GROSS_LONG_TASK_MS = 400;

const DESIGNER = "designer@fjordline.example";
const VIEWER = "viewer@fjordline.example";
const PASSWORD = "railwise-demo";

interface ScenarioRow {
  id: string;
  name: string;
}

let server: TestServer;
let browser: Browser;
let scenarios: ScenarioRow[] = [];

async function listScenarios(): Promise<ScenarioRow[]> {
  const api = await signIn(server.url, DESIGNER, PASSWORD);
  const boards = (await (await api.fetch("/api/boards")).json()) as { items: { id: string; name: string }[] };
  const out: ScenarioRow[] = [];
  for (const b of boards.items) {
    const list = (await (await api.fetch(`/api/scenarios?boardId=${b.id}`)).json()) as { items: ScenarioRow[] };
    out.push(...list.items.map((s) => ({ id: s.id, name: s.name })));
  }
  return out;
}

async function designerPage(width = 1280): Promise<{ ctx: BrowserContext; page: Page }> {
  const ctx = await browser.newContext({ viewport: { width, height: 900 }, acceptDownloads: true });
  const page = await ctx.newPage();
  await signInPage(page, server.url, DESIGNER);
  return { ctx, page };
}

/** Press Run and wait for the Trace to draw; returns ms from the press to the first plot (page clock). */
async function runAndTime(page: Page, how: "button" | "shortcut"): Promise<number> {
  const before = await page.evaluate(() => window.__railwiseTimings?.firstPlot.length ?? 0);
  if (how === "button") await page.getByTestId("run-button").click();
  else await page.keyboard.press("Control+Enter");
  await page.waitForFunction((n) => (window.__railwiseTimings?.firstPlot.length ?? 0) > n, before, { timeout: 60_000 });
  return page.evaluate(() => window.__railwiseTimings!.firstPlot.at(-1)!.ms);
}

beforeAll(async () => {
  server = await startServer();
  browser = await launchBrowser();
  scenarios = await listScenarios();
  mkdirSync(SCREENSHOT_DIR, { recursive: true });
});

afterAll(async () => {
  await browser?.close();
  await server?.stop();
});

describe("workbench (designer)", () => {
  it("takes the battery cut-off from an RKM edit to a saved run opened by its URL", async () => {
    const battery = scenarios.find((s) => /battery/i.test(s.name));
    expect(battery, "demo scenario 'Battery low-voltage disconnect' is seeded").toBeTruthy();
    const { ctx, page } = await designerPage(1280);
    try {
      // First-load JS of the workbench page: every script the browser fetched to show it.
      await page.goto(`${server.url}/scenarios/${battery!.id}`);
      await page.getByTestId("run-button").waitFor();
      const js = await page.evaluate(() =>
        performance
          .getEntriesByType("resource")
          .filter((e) => (e as PerformanceResourceTiming).initiatorType === "script" || e.name.endsWith(".js"))
          .reduce(
            (a, e) => {
              const r = e as PerformanceResourceTiming;
              return {
                transfer: a.transfer + r.transferSize,
                decoded: a.decoded + r.decodedBodySize,
                files: a.files + 1,
              };
            },
            { transfer: 0, decoded: 0, files: 0 },
          ),
      );
      console.log(
        `[workbench] first-load JS: ${js.files} files, ${(js.transfer / 1024).toFixed(1)} kB transferred, ${(js.decoded / 1024).toFixed(1)} kB decoded`,
      );
      expect(js.files).toBeGreaterThan(0);

      // Type rFeedback as an RKM code: 1M0 = 1 MΩ (IEC 60062).
      const field = page.locator('input[name="stage.rFeedback"]');
      await field.fill("1M0");
      await expect.poll(() => page.locator('[data-parsed="stage.rFeedback"]').textContent()).toContain("1 MΩ");
      await expect.poll(() => page.getByTestId("stage-diagram").textContent()).toContain("1 MΩ");

      const ms = await runAndTime(page, "shortcut");
      console.log(`[workbench] battery cut-off, Ctrl+Enter → first plot: ${ms.toFixed(0)} ms`);
      // Target 1 s (issue 5), reported above; the assertion only catches a gross regression
      // because the browser shares 2 cores with the server and the test runner.
      expect(ms).toBeLessThan(GROSS_FIRST_PLOT_MS);

      // Thresholds in Readings: measured next to the closed form. Inverting trigger,
      // upper = (Vref·rFb + Voh·rRef)/(rRef + rFb) + Vos, lower with Vol (tests/REFERENCES.md).
      // Demo values: Vref 2.5 V, rRef 33 kΩ, rFb 1 MΩ, rail-to-rail CMOS: Voh 4.98, Vol 0.02, Vos 0.5 mV.
      const upper = (2.5 * 1e6 + 4.98 * 33e3) / (33e3 + 1e6) + 0.5e-3;
      const lower = (2.5 * 1e6 + 0.02 * 33e3) / (33e3 + 1e6) + 0.5e-3;
      const readings = page.getByTestId("readings");
      await readings.waitFor();
      const upperRow = page.locator('[data-check="Upper switching point"]');
      const lowerRow = page.locator('[data-check="Lower switching point"]');
      await expect.poll(() => upperRow.textContent()).toMatch(/pass/);
      await expect.poll(() => lowerRow.textContent()).toMatch(/pass/);
      // The battery reads in battery volts first; the pin volts sit beneath ([data-pin]).
      const measuredUpper = parseFloat(
        (await upperRow.locator("td").nth(2).locator("[data-pin]").textContent())!.replace(/[^\d.-]/g, ""),
      );
      const measuredLower = parseFloat(
        (await lowerRow.locator("td").nth(2).locator("[data-pin]").textContent())!.replace(/[^\d.-]/g, ""),
      );
      const batteryUpper = parseFloat(
        (await upperRow.locator("td").nth(2).locator("[data-source]").textContent())!.replace(/[^\d.-]/g, ""),
      );
      // Unloaded divider 68 k / 18 k: battery = pin · (68 + 18) / 18 (voltage-divider formula); 4 significant figures shown.
      expect(Math.abs(batteryUpper - (measuredUpper * 86) / 18)).toBeLessThan(0.01);
      console.log(
        `[workbench] thresholds measured ${measuredUpper} / ${measuredLower} V, closed form ${upper.toFixed(4)} / ${lower.toFixed(4)} V`,
      );
      // Noise (4 mV rms) moves single crossings; the mean over a few edges stays within ~1 %.
      expect(Math.abs(measuredUpper - upper)).toBeLessThan(0.02 * upper);
      expect(Math.abs(measuredLower - lower)).toBeLessThan(0.02 * lower);

      // Cursor sync: hovering the Trace puts the ring on the Loop.
      const trace = page.locator('[data-testid="trace-plot"] .u-over');
      const box = (await trace.boundingBox())!;
      await page.mouse.move(box.x + box.width * 0.4, box.y + box.height / 2);
      await expect
        .poll(() => page.locator('[data-testid="loop-plot"] [data-testid="cursor-readout"]').textContent())
        .toContain("input");
      await expect
        .poll(() => page.locator(".rw-loop-marker").evaluate((el) => (el as HTMLElement).style.display))
        .toBe("block");

      await screenshot(page, "workbench-1280");
      await page.getByTestId("loop-plot").screenshot({ path: path.join(SCREENSHOT_DIR, "workbench-loop.png") });

      // Save run: the edit is saved first (new version), then the server re-runs and stores it.
      await page.getByLabel("Run label").fill("RKM edit 1M0");
      await page.getByTestId("save-run-button").click();
      const link = page.getByTestId("saved-run-link");
      await link.waitFor({ timeout: 30_000 });
      const href = (await link.getAttribute("href"))!;
      expect(href).toMatch(/^\/runs\/.+/);

      // Open the run by its URL, as a colleague with the link would.
      const runPage = await ctx.newPage();
      await runPage.goto(`${server.url}${href}`);
      await runPage.getByTestId("run-view").waitFor();
      await expect.poll(() => runPage.getByTestId("run-title").textContent()).toContain("RKM edit 1M0");
      const snap = await runPage.getByTestId("scenario-tables").textContent();
      expect(snap).toContain("1 MΩ");
      await expect.poll(() => runPage.locator('[data-check="Upper switching point"]').textContent()).toMatch(/pass/);
      await runPage.locator('[data-testid="trace-plot"] canvas').first().waitFor();
      await screenshot(runPage, "run-page");

      // The printable design summary: stage, values, designed and worst-case figures, the saved
      // run's measurements and the load caution (this stage disconnects a battery load).
      const summary = await ctx.newPage();
      await summary.goto(`${server.url}/scenarios/${battery!.id}/summary`);
      await summary.getByTestId("design-summary").waitFor();
      await expect.poll(() => summary.getByTestId("summary-figures").textContent()).toContain("Upper switching point");
      await summary.getByTestId("checks").waitFor({ timeout: 15_000 });
      expect(await summary.getByTestId("safety-caution").count()).toBe(1);
      await screenshot(summary, "design-summary");
    } finally {
      await ctx.close();
    }
  });

  it("draws the first plot within 1 s of Run for every demo scenario", async () => {
    const { ctx, page } = await designerPage(1280);
    type Figure = { name: string; ms: number; points: number; resultMs: number | null; simMs: number | null };
    const figures: Figure[] = [];
    const cold: Figure[] = [];
    try {
      for (const s of scenarios) {
        // Cold: Run pressed the moment the button appears, while the worker may still be loading.
        await page.goto(`${server.url}/scenarios/${s.id}`);
        await page.getByTestId("run-button").waitFor();
        const coldMs = await runAndTime(page, "button");
        cold.push({
          ...(await page.evaluate(() => window.__railwiseTimings!.firstPlot.at(-1)!)),
          name: s.name,
          ms: coldMs,
        });
        // Ready: the run bar says "Solver ready." (worker loaded, solver compiled), as a user sees it.
        await page.goto(`${server.url}/scenarios/${s.id}`);
        await page.waitForFunction(
          () => document.querySelector('[data-testid="run-status"]')?.textContent === "Solver ready.",
          null,
          { timeout: 30_000 },
        );
        // The load-switching caution follows the scenario's own words, not the board's (DEVELOPERS.md § Safety caution).
        expect(await page.getByTestId("safety-caution").count(), s.name).toBe(/battery|bilge/i.test(s.name) ? 1 : 0);
        const ms = await runAndTime(page, "button");
        figures.push({ ...(await page.evaluate(() => window.__railwiseTimings!.firstPlot.at(-1)!)), name: s.name, ms });
      }
    } finally {
      await ctx.close();
    }
    console.log("[workbench] Run pressed as soon as the page shows it (worker still loading) → first plot:");
    for (const f of cold) console.log(`  ${f.name.padEnd(36)} ${f.ms.toFixed(0).padStart(5)} ms`);
    console.log("[workbench] Run after 'Solver ready.' → first plot, headless Chromium (performance.now marks):");
    for (const f of figures)
      console.log(
        `  ${f.name.padEnd(36)} ${f.ms.toFixed(0).padStart(5)} ms  (result from the worker at ${f.resultMs?.toFixed(0)} ms, solver ${f.simMs?.toFixed(0)} ms; ${f.points} samples)`,
      );
    expect(figures.length).toBeGreaterThanOrEqual(5);
    const over = figures.filter((f) => f.ms >= 1000).map((f) => f.name);
    console.log(
      over.length
        ? `[workbench] over the 1 s target: ${over.join(", ")}`
        : "[workbench] every demo scenario under the 1 s target",
    );
    for (const f of figures) expect(f.ms, f.name).toBeLessThan(GROSS_FIRST_PLOT_MS);
  });

  it("stays responsive through a 1,000,000-segment noise run (no main-thread task over 100 ms)", async () => {
    const battery = scenarios.find((s) => /battery/i.test(s.name))!;
    const { ctx, page } = await designerPage(1280);
    try {
      await page.goto(`${server.url}/scenarios/${battery.id}`);
      await page.getByTestId("run-button").waitFor();
      await page.getByRole("tab", { name: "Signal" }).click();
      // 120 s run, noise at 1/(2·bandwidth): bandwidth 4166.67 Hz → 1,000,000 segments.
      await page.locator('input[name="noise.bandwidth"]').fill("4166.67");
      await page.locator('input[name="run.points"]').fill("200000");
      await page.evaluate(() => {
        const w = window as unknown as { __longTasks: number[] };
        w.__longTasks = [];
        new PerformanceObserver((list) => {
          for (const e of list.getEntries()) w.__longTasks.push(e.duration);
        }).observe({ type: "longtask" });
      });
      const start = Date.now();
      await page.getByTestId("run-button").click();
      // While it runs the page must keep answering: the progress bar moves and a click lands.
      await page
        .getByTestId("cancel-button")
        .waitFor({ timeout: 10_000 })
        .catch(() => undefined);
      await page.getByRole("tab", { name: "Stage" }).click();
      await page.waitForFunction(
        () => document.querySelector('[data-testid="run-status"]')?.textContent?.startsWith("Done"),
        null,
        { timeout: 120_000 },
      );
      const wall = Date.now() - start;
      await page.waitForTimeout(300);
      const tasks = await page.evaluate(() => (window as unknown as { __longTasks: number[] }).__longTasks);
      const worst = tasks.length ? Math.max(...tasks) : 0;
      console.log(
        `[workbench] 1e6-segment run: ${wall} ms wall, ${tasks.length} long tasks, longest ${worst.toFixed(0)} ms`,
      );
      console.log(`[workbench] longest main-thread task ${worst < 100 ? "within" : "OVER"} the 100 ms target`);
      // Target 100 ms (issue 5), reported above. A load spike on the shared 2-core machine can
      // stretch one task past it; a main thread that did the solving would block for seconds.
      expect(worst).toBeLessThan(GROSS_LONG_TASK_MS);
    } finally {
      await ctx.close();
    }
  });

  it("designs the water-temperature alarm from °C through an NTC divider, applies it and measures it", async () => {
    const water = scenarios.find((s) => /temperature/i.test(s.name));
    expect(water, "demo scenario 'Water-temperature alarm' is seeded").toBeTruthy();
    const { ctx, page } = await designerPage(1280);
    try {
      await page.goto(`${server.url}/scenarios/${water!.id}`);
      await page.getByTestId("run-button").waitFor();
      await page.getByRole("tab", { name: "From spec" }).click();
      await page.locator('select[name="spec.sensor"]').selectOption("ntc");
      await page.locator('input[name="spec.upper"]').fill("19");
      await page.locator('input[name="spec.lower"]').fill("17.5");
      await page.getByLabel("divider from the supply (choose it for me)").check();
      // The NTC mapping (Beta model, 10 kΩ / B 3977 K at the bottom under 15 kΩ from 5 V) is shown before anything is designed.
      await expect
        .poll(() => page.getByTestId("sensor-mapping").textContent())
        .toMatch(/upper 2\.4\d* V, lower 2\.3\d* V/);
      await page.getByTestId("design-button").click();
      await page.getByTestId("design-figures").waitFor();
      const figures = await page.getByTestId("design-figures").textContent();
      expect(figures).toMatch(/Upper switching point/);
      expect(await page.getByTestId("design-parts").locator("tbody tr").count()).toBeGreaterThanOrEqual(3);
      await page
        .getByTestId("from-spec-panel")
        .screenshot({ path: path.join(SCREENSHOT_DIR, "workbench-from-spec.png") });
      await page.getByTestId("apply-design").click();
      await page.getByTestId("stage-panel").waitFor();
      const ms = await runAndTime(page, "button");
      console.log(`[workbench] water-temperature alarm after Apply: first plot ${ms.toFixed(0)} ms`);
      await expect.poll(() => page.locator('[data-check="Upper switching point"]').textContent()).toMatch(/pass/);
      await expect.poll(() => page.locator('[data-check="Lower switching point"]').textContent()).toMatch(/pass/);
      await page.getByRole("tab", { name: "Signal" }).click();
      await page.getByTestId("signal-panel").screenshot({ path: path.join(SCREENSHOT_DIR, "workbench-signal.png") });
    } finally {
      await ctx.close();
    }
  });

  it("fits at 1680 px", async () => {
    const blinker = scenarios.find((s) => /blinker|lamp/i.test(s.name)) ?? scenarios[0];
    const { ctx, page } = await designerPage(1680);
    try {
      await page.goto(`${server.url}/scenarios/${blinker.id}`);
      await page.getByTestId("run-button").waitFor();
      await runAndTime(page, "button");
      const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
      expect(overflow).toBeLessThanOrEqual(0);
      await screenshot(page, "workbench-1680");
    } finally {
      await ctx.close();
    }
  });
});

describe("workbench (viewer)", () => {
  it("shows tables and run plots but no edit controls", async () => {
    const battery = scenarios.find((s) => /battery/i.test(s.name))!;
    const ctx = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    const page = await ctx.newPage();
    try {
      await signInPage(page, server.url, VIEWER);
      await page.goto(`${server.url}/scenarios/${battery.id}`);
      await page.getByTestId("scenario-readonly").waitFor();
      await page.getByTestId("scenario-tables").waitFor();
      expect(await page.getByTestId("run-button").count()).toBe(0);
      expect(await page.getByTestId("save-button").count()).toBe(0);
      expect(await page.getByTestId("save-run-button").count()).toBe(0);
      expect(await page.locator('input[name^="stage."], select[name="stage.kind"]').count()).toBe(0);
      // The run saved by the designer above is listed with its plots.
      await page.locator('[data-testid="trace-plot"] canvas').first().waitFor({ timeout: 15_000 });
      await screenshot(page, "scenario-viewer");
    } finally {
      await ctx.close();
    }
  });
});

// Studies end to end in real Chromium: both studies on a demo scenario in the study worker
// pool, wall times measured in the page (reported, not asserted: performance is judged by
// `npm run bench`), main-thread long tasks while they run, cancel leaving no worker alive
// (counted by the browser itself through playwright's page.workers()), saving with a run, and
// the run page and shared-link page showing the saved study. Screenshots in
// test-output/screenshots/studies-*.png.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { mkdirSync, writeFileSync } from "node:fs";
import path from "node:path";
import type { Browser, BrowserContext, Page } from "playwright-core";
import { launchBrowser, screenshot, signInPage, SCREENSHOT_DIR } from "../helpers/browser";
import { signIn, startServer, type TestServer } from "../helpers/server";
import { DEMO_SCENARIOS } from "@/lib/demo/scenarios";

const DESIGNER = "designer@fjordline.example";
const VIEWER = "viewer@fjordline.example";
const PASSWORD = "railwise-demo";

let server: TestServer;
let browser: Browser;
let ctx: BrowserContext;
let page: Page;
let scenarioId = "";
const figures: Record<string, unknown> = {};

/** Long main-thread tasks (Long Tasks API) and the largest gap between animation frames. */
async function startJankProbe(p: Page) {
  await p.evaluate(() => {
    const w = window as unknown as { __jank: { longest: number; count: number; maxGap: number; stop: boolean } };
    w.__jank = { longest: 0, count: 0, maxGap: 0, stop: false };
    new PerformanceObserver((list) => {
      for (const e of list.getEntries()) {
        w.__jank.count++;
        w.__jank.longest = Math.max(w.__jank.longest, e.duration);
      }
    }).observe({ type: "longtask" });
    let last = performance.now();
    const tick = (now: number) => {
      w.__jank.maxGap = Math.max(w.__jank.maxGap, now - last);
      last = now;
      if (!w.__jank.stop) requestAnimationFrame(tick);
    };
    requestAnimationFrame(tick);
  });
}
async function stopJankProbe(p: Page) {
  return p.evaluate(() => {
    const w = window as unknown as { __jank: { longest: number; count: number; maxGap: number; stop: boolean } };
    w.__jank.stop = true;
    return {
      longestTaskMs: Math.round(w.__jank.longest),
      longTasks: w.__jank.count,
      maxFrameGapMs: Math.round(w.__jank.maxGap),
    };
  });
}

/** Wall time shown by the study itself ("… runs in 1.23 s on 2 workers"). */
async function reportedSeconds(p: Page, testId: string): Promise<{ runs: number; seconds: number; workers: number }> {
  const text = (await p.getByTestId(testId).textContent()) ?? "";
  const m = text.match(/([\d,]+) runs in ([\d.]+) s on (\d+) workers/);
  if (!m) throw new Error(`no timing in: ${text.slice(0, 300)}`);
  return { runs: Number(m[1].replace(/,/g, "")), seconds: Number(m[2]), workers: Number(m[3]) };
}

beforeAll(async () => {
  server = await startServer();
  browser = await launchBrowser();
  mkdirSync(SCREENSHOT_DIR, { recursive: true });
  // A copy of the demo bilge float filter with a 20,000-sample run: the size the figures name.
  const api = await signIn(server.url, DESIGNER, PASSWORD);
  const boards = (await (await api.fetch("/api/boards")).json()) as { items: { id: string; name: string }[] };
  const board = boards.items.find((b) => /buoy/i.test(b.name)) ?? boards.items[0];
  const bilge = DEMO_SCENARIOS.find((s) => s.key === "bilge-float")!.scenario;
  const res = await api.fetch("/api/scenarios", {
    method: "POST",
    body: JSON.stringify({
      boardId: board.id,
      name: "Bilge float, 20k samples",
      scenario: { ...bilge, name: "Bilge float, 20k samples", run: { ...bilge.run, points: 20_000 } },
    }),
  });
  expect(res.status).toBe(201);
  scenarioId = ((await res.json()) as { id: string }).id;
  ctx = await browser.newContext({ viewport: { width: 1440, height: 1000 } });
  page = await ctx.newPage();
  await signInPage(page, server.url, DESIGNER);
  await page.goto(`${server.url}/scenarios/${scenarioId}`);
  await page.getByTestId("studies-card").waitFor({ timeout: 60_000 });
  figures.hardwareConcurrency = await page.evaluate(() => navigator.hardwareConcurrency);
  figures.loadAverageAtStart = (await import("node:os")).loadavg().map((l) => Number(l.toFixed(1)));
  // Baseline: the idle Workbench for 5 s, to tell the studies' main-thread cost from this
  // machine's own stalls (other processes share its two cores).
  await startJankProbe(page);
  await page.waitForTimeout(5000);
  figures.idleBaseline = await stopJankProbe(page);
});

afterAll(async () => {
  mkdirSync(path.resolve(__dirname, "../../test-output"), { recursive: true });
  writeFileSync(path.resolve(__dirname, "../../test-output/studies-e2e.json"), JSON.stringify(figures, null, 2));
  console.log("[studies e2e figures]", JSON.stringify(figures));
  await ctx?.close();
  await browser?.close();
  await server?.stop();
});

describe("studies in the browser", () => {
  it("runs a 20-level × 50-seed noise margin study with the capture's noise marked", async () => {
    const form = page.getByTestId("noise-form");
    await expect(form.locator('[data-field="noise-levels"]').inputValue()).resolves.toBe("20");
    await expect(form.locator('[data-field="noise-seeds"]').inputValue()).resolves.toBe("50");
    await startJankProbe(page);
    const t0 = Date.now();
    await page.getByTestId("run-noise-study").click();
    await page.getByTestId("noise-margin-result").waitFor({ timeout: 120_000 });
    const clickToResult = Date.now() - t0;
    const jank = await stopJankProbe(page);
    const t = await reportedSeconds(page, "noise-margin-result");
    expect(t.runs).toBe(1001);
    figures.noiseStudy = { ...t, clickToResultMs: clickToResult, ...jank };
    await expect(page.getByTestId("noise-verdict").textContent()).resolves.toMatch(/Chatter (stays|exceeds)/);
    await expect(page.getByTestId("measured-verdict").textContent()).resolves.toMatch(/capture noise: .* rms/);
    // The chart is drawn (uPlot canvas inside the plot container).
    expect(await page.getByTestId("chatter-plot").locator("canvas").count()).toBeGreaterThan(0);
    await page.getByTestId("studies-card").screenshot({ path: path.join(SCREENSHOT_DIR, "studies-noise-card.png") });
  });

  it("runs 1,000 tolerance draws of the 20,000-sample run with corners and the spec window", async () => {
    await page.getByRole("tab", { name: "Tolerance spread" }).click();
    const form = page.getByTestId("tolerance-form");
    await expect(form.locator('[data-field="tol-draws"]').inputValue()).resolves.toBe("1000");
    await startJankProbe(page);
    const t0 = Date.now();
    await page.getByTestId("run-tolerance-study").click();
    await page.getByTestId("tolerance-result").waitFor({ timeout: 120_000 });
    const clickToResult = Date.now() - t0;
    const jank = await stopJankProbe(page);
    const t = await reportedSeconds(page, "tolerance-result");
    expect(t.runs).toBe(1001);
    figures.toleranceSpread = { ...t, clickToResultMs: clickToResult, ...jank };
    await expect(page.getByTestId("tolerance-verdict").textContent()).resolves.toMatch(
      /of 1,000 draws inside the spec window/,
    );
    // The charts mount a frame after the verdict (they wait for their box's width): poll, on a loaded machine.
    await expect.poll(() => page.getByTestId("histogram-upperThreshold").locator("canvas").count()).toBeGreaterThan(0);
    await expect.poll(() => page.getByTestId("histogram-lowerThreshold").locator("canvas").count()).toBeGreaterThan(0);
    await screenshot(page, "studies-workbench");
    await page
      .getByTestId("studies-card")
      .screenshot({ path: path.join(SCREENSHOT_DIR, "studies-tolerance-card.png") });
  });

  it("cancel stops every study worker", async () => {
    const baseline = page.workers().length;
    await page.locator('[data-field="tol-draws"]').fill("20000");
    await page.getByTestId("run-tolerance-study").click();
    await page.getByTestId("study-progress").waitFor();
    // Workers are up while the study runs.
    await expect.poll(() => page.workers().length, { timeout: 10_000 }).toBeGreaterThan(baseline);
    figures.workersWhileRunning = page.workers().length - baseline;
    await page.getByTestId("cancel-study-button").click();
    await expect(page.getByTestId("study-error").textContent()).resolves.toMatch(/cancelled/i);
    await expect.poll(() => page.workers().length, { timeout: 5_000 }).toBe(baseline);
    figures.workersAfterCancel = page.workers().length - baseline;
    // The earlier results are still there and still savable.
    await page.locator('[data-field="tol-draws"]').fill("1000");
  });

  it("saves both studies with a new run; the run page and its shared link show them", async () => {
    await page.getByTestId("save-study-button").click();
    await page.getByTestId("study-saved").waitFor({ timeout: 60_000 });
    const href = await page.getByTestId("study-run-link").getAttribute("href");
    const runId = href!.split("/").pop()!;
    await page.goto(`${server.url}/runs/${runId}`);
    await page.getByTestId("saved-studies").waitFor({ timeout: 60_000 });
    await page.getByTestId("chatter-plot").locator("canvas").first().waitFor();
    await expect(page.getByTestId("noise-verdict").textContent()).resolves.toMatch(/Chatter/);
    await expect(page.getByTestId("tolerance-verdict").textContent()).resolves.toMatch(
      /of 1,000 draws inside the spec window/,
    );
    await page.getByTestId("saved-studies").scrollIntoViewIfNeeded();
    await screenshot(page, "studies-run-page");

    // Stored through the API and recomputed by the server.
    const api = await signIn(server.url, DESIGNER, PASSWORD);
    const stored = (await (await api.fetch(`/api/runs/${runId}/study`)).json()) as {
      study: { noiseMargin: { summary: { levels: unknown[] } }; toleranceSpread: { summary: { draws: number } } };
    };
    expect(stored.study.noiseMargin.summary.levels).toHaveLength(20);
    expect(stored.study.toleranceSpread.summary.draws).toBe(1000);

    // A tampered upload is refused with the field named; a viewer may not save at all.
    const full = (await (await api.fetch(`/api/runs/${runId}/study`)).json()) as {
      study: { schema: string; noiseMargin: { config: unknown; tasks: { transitions: number }[] } };
    };
    const tasks = full.study.noiseMargin.tasks.map((t) => ({ ...t }));
    tasks[0].transitions += 3;
    const bad = await api.fetch(`/api/runs/${runId}/study`, {
      method: "PUT",
      body: JSON.stringify({
        schema: "railwise.study/1",
        noiseMargin: { config: full.study.noiseMargin.config, tasks },
      }),
    });
    expect(bad.status).toBe(400);
    expect(((await bad.json()) as { message: string }).message).toMatch(/noiseMargin\.tasks\[0\]/);
    const junk = await api.fetch(`/api/runs/${runId}/study`, {
      method: "PUT",
      body: JSON.stringify({
        schema: "railwise.study/1",
        noiseMargin: { config: { kind: "noise-margin", levels: 1 }, tasks: [] },
      }),
    });
    expect(junk.status).toBe(400);
    const viewer = await signIn(server.url, VIEWER, PASSWORD);
    const denied = await viewer.fetch(`/api/runs/${runId}/study`, {
      method: "PUT",
      body: JSON.stringify({ schema: "railwise.study/1", noiseMargin: full.study.noiseMargin }),
    });
    expect(denied.status).toBe(403);

    // The shared link, opened without a session.
    const link = (await (await api.fetch(`/api/runs/${runId}/links`, { method: "POST", body: "{}" })).json()) as {
      token: string;
      url?: string;
    };
    const anon = await browser.newContext({ viewport: { width: 1280, height: 1000 } });
    const shared = await anon.newPage();
    await shared.goto(link.url ?? `${server.url}/share/${link.token}`);
    await shared.getByTestId("saved-studies").waitFor({ timeout: 60_000 });
    await shared.getByTestId("histogram-upperThreshold").locator("canvas").first().waitFor();
    await shared.getByTestId("saved-studies").scrollIntoViewIfNeeded();
    await screenshot(shared, "studies-shared-link");
    await anon.close();
  });
});

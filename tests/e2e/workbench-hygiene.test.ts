// End to end in real Chromium: the Workbench never shows a stale result as current, refuses to
// run or save while a field is invalid, keeps unsaved edits, labels plot ticks with their own
// values, reads amplifiers as amplifiers and checks that switching stages add no edges.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, BrowserContext, Page } from "playwright-core";
import { writeFileSync, mkdirSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { launchBrowser, screenshot, signInPage } from "../helpers/browser";
import { signIn, startServer, type TestServer } from "../helpers/server";
import { parseQuantity } from "@/lib/design/notation";

const DESIGNER = "designer@fjordline.example";
const PASSWORD = "railwise-demo";

let server: TestServer;
let browser: Browser;
let scenarios: { id: string; name: string }[] = [];

async function listScenarios() {
  const api = await signIn(server.url, DESIGNER, PASSWORD);
  const boards = (await (await api.fetch("/api/boards")).json()) as { items: { id: string }[] };
  const out: { id: string; name: string }[] = [];
  for (const b of boards.items) {
    const list = (await (await api.fetch(`/api/scenarios?boardId=${b.id}`)).json()) as {
      items: { id: string; name: string }[];
    };
    out.push(...list.items.map((s) => ({ id: s.id, name: s.name })));
  }
  return out;
}

function scenarioId(re: RegExp): string {
  const s = scenarios.find((x) => re.test(x.name));
  if (!s) throw new Error(`demo scenario matching ${re} is not seeded`);
  return s.id;
}

async function designer(width = 1280): Promise<{ ctx: BrowserContext; page: Page }> {
  const ctx = await browser.newContext({ viewport: { width, height: 900 } });
  const page = await ctx.newPage();
  await signInPage(page, server.url, DESIGNER);
  return { ctx, page };
}

async function openWorkbench(page: Page, id: string) {
  await page.goto(`${server.url}/scenarios/${id}`);
  await page.getByTestId("run-button").waitFor();
  await expect.poll(() => page.getByTestId("run-status").textContent(), { timeout: 30_000 }).toMatch(/Solver ready/);
}

async function runAndWait(page: Page) {
  await page.getByTestId("run-button").click();
  await expect.poll(() => page.getByTestId("run-status").textContent(), { timeout: 60_000 }).toMatch(/^Done in/);
}

/** Type into a workbench field by its data-field name (fill, then leave the field). */
async function typeField(page: Page, name: string, text: string) {
  const f = page.locator(`input[name="${name}"]`);
  await f.fill(text);
}

beforeAll(async () => {
  server = await startServer();
  browser = await launchBrowser();
  scenarios = await listScenarios();
});

afterAll(async () => {
  await browser?.close();
  await server?.stop();
});

describe("invalid fields stop Run and Save; earlier results turn stale (#16 item 1)", () => {
  it("refuses Run with a list of the fields at fault, focuses the first, and marks the old run out of date", async () => {
    const { ctx, page } = await designer();
    try {
      await openWorkbench(page, scenarioId(/battery/i));
      await runAndWait(page);
      const statusBefore = await page.getByTestId("run-status").textContent();
      await expect.poll(() => page.getByTestId("stale-result").count()).toBe(0);

      await typeField(page, "stage.rReference", "-10k");
      await typeField(page, "supply.positive", "six");
      await typeField(page, "opamp.gainBandwidth", "");
      await page.getByTestId("run-button").click();

      const list = page.getByTestId("fields-at-fault");
      await list.waitFor();
      const items = await list.locator("li").allTextContents();
      expect(items.length).toBeGreaterThanOrEqual(3);
      expect(items.join(" | ")).toMatch(/V\+: not a value/);
      // The run did not happen: the status says so instead of "Done in …".
      const status = await page.getByTestId("run-status").textContent();
      expect(status).toMatch(/Not run/);
      expect(status).not.toBe(statusBefore);
      // Focus is on the first listed field.
      const focusedName = await page.evaluate(() =>
        (document.activeElement as HTMLInputElement | null)?.getAttribute("data-field"),
      );
      const firstLabel = items[0].split(":")[0].trim();
      const focusedLabel = await page.evaluate(() => {
        const el = document.activeElement as HTMLElement | null;
        return el?.closest("label")?.querySelector("span")?.textContent?.trim() ?? null;
      });
      expect(focusedName).toBeTruthy();
      expect(focusedLabel).toBe(firstLabel);
      // The earlier plots and readings are marked out of date.
      expect(await page.getByTestId("stale-result").count()).toBeGreaterThanOrEqual(3);

      // Save is refused the same way.
      await page.getByTestId("save-button").click();
      await expect.poll(() => page.getByTestId("workbench-notice").textContent()).toMatch(/Save refused/);

      // Points far beyond the bound: refused too.
      await typeField(page, "supply.positive", "5");
      await typeField(page, "stage.rReference", "33k");
      await typeField(page, "opamp.gainBandwidth", "1M");
      await page.getByRole("tab", { name: "Signal" }).click();
      await typeField(page, "run.points", "1e9");
      await page.getByTestId("run-button").click();
      await expect.poll(() => page.getByTestId("fields-at-fault").textContent()).toMatch(/Output points/);
      await screenshot(page, "hygiene-refused-run");
    } finally {
      await ctx.close();
    }
  });
});

describe("value entry (#16 item 11)", () => {
  it('answers "meg" with what to write instead and refuses to run on it', async () => {
    const { ctx, page } = await designer();
    try {
      await openWorkbench(page, scenarioId(/battery/i));
      await typeField(page, "stage.rFeedback", "1meg");
      // "meg" is not an SI prefix (BIPM SI Brochure table 7) nor an IEC 60062 letter.
      await expect
        .poll(() => page.locator('[data-parsed="stage.rFeedback"]').textContent())
        .toMatch(/write M for mega/);
      await page.getByTestId("run-button").click();
      await expect.poll(() => page.getByTestId("fields-at-fault").textContent()).toMatch(/write M for mega/);
      await typeField(page, "stage.rFeedback", "1M0");
      await expect.poll(() => page.locator('[data-parsed="stage.rFeedback"]').textContent()).toContain("1 MΩ");
    } finally {
      await ctx.close();
    }
  });
});

describe("tick labels (#16 item 3)", () => {
  it("labels every tick of the Trace and Loop with its own value, at several widths", async () => {
    const { ctx, page } = await designer(1280);
    try {
      await openWorkbench(page, scenarioId(/status-lamp|blinker/i));
      await runAndWait(page);
      const seen: string[][] = [];
      // The oscillator's capacitor is on the Trace with its two switching levels (#10).
      expect(await page.getByTestId("trace-plot").getAttribute("data-series")).toMatch(
        /capacitor \(v−\).*switching levels of the capacitor/,
      );
      // Widths in small steps: uPlot picks 1, 2, 2.5 or 5 × 10ⁿ per tick from the pixels it has.
      const widths = [390, 480];
      for (let w = 640; w <= 1840; w += 60) widths.push(w);
      for (const width of widths) {
        await page.setViewportSize({ width, height: 900 });
        await page.waitForTimeout(250);
        const sets = await page.evaluate(() =>
          Array.from(
            document.querySelectorAll<HTMLElement>("[data-testid=trace-plot] .uplot, [data-testid=loop-plot] .uplot"),
          ).flatMap((el) =>
            [el.dataset.ticks0, el.dataset.ticks1].filter((x): x is string => !!x).map((x) => x.split("|")),
          ),
        );
        seen.push(...sets);
      }
      expect(seen.length).toBeGreaterThan(0);
      let nonRound = 0;
      for (const labels of seen) {
        // Each label is a quantity; consecutive ticks are equally spaced (uPlot places ticks on a
        // uniform grid), so the labels must be too — "0.3, 0.5, 0.8" for quarter steps is not.
        const values = labels.map((l) => parseQuantity(l.replace(/\s+/g, "")));
        expect(
          values.every((v) => v !== null),
          `labels parse: ${labels.join(", ")}`,
        ).toBe(true);
        const v = values as number[];
        if (v.length < 3) continue;
        const step = v[1] - v[0];
        for (let i = 2; i < v.length; i++)
          expect(Math.abs(v[i] - v[i - 1] - step), `equal spacing: ${labels.join(", ")}`).toBeLessThan(
            Math.abs(step) * 1e-6,
          );
        const mant = Math.abs(step) / 10 ** Math.floor(Math.log10(Math.abs(step)));
        if (Math.abs(mant - 2.5) < 1e-9) nonRound++;
      }
      console.log(
        `[hygiene] tick sets read: ${seen.length}, with 2.5-type steps: ${nonRound}; e.g. ${seen
          .slice(0, 3)
          .map((s) => s.join(" "))
          .join(" / ")}`,
      );
      // The sweep must have met the case that used to be mislabelled (0.25 s read as 0.3 s).
      expect(nonRound).toBeGreaterThan(0);
    } finally {
      await ctx.close();
    }
  });
});

describe("switching stages check for extra transitions (#16 item 5)", () => {
  it("lists 'No extra transitions' in the checks, failing when the chatter count is above 0", async () => {
    const { ctx, page } = await designer();
    try {
      await openWorkbench(page, scenarioId(/bilge float bounce/i));
      await runAndWait(page);
      const row = page.locator('[data-check="No extra transitions"]');
      await row.waitFor();
      const chatterText = await page.locator('[data-metric="Chatter"] td').nth(1).textContent();
      const chatter = Number(chatterText);
      const result = (await row.locator("td").nth(3).textContent())!.trim();
      console.log(`[hygiene] bilge filter chatter ${chatter}, check ${result}`);
      expect(Number.isFinite(chatter)).toBe(true);
      expect(result).toBe(chatter > 0 ? "fail" : "pass");
    } finally {
      await ctx.close();
    }
  });
});

describe("amplifiers read as amplifiers (#10)", () => {
  it("shows gain, output limits, clipped share and clip inputs, with no switching rows or edge markers", async () => {
    const { ctx, page } = await designer();
    try {
      await openWorkbench(page, scenarioId(/hydrophone/i));
      await runAndWait(page);
      const metrics = page.getByTestId("metrics");
      await metrics.waitFor();
      const names = await metrics.locator("tr").evaluateAll((rows) => rows.map((r) => r.getAttribute("data-metric")));
      for (const want of [
        "Gain (linear region)",
        "Output high limit (Voh)",
        "Output low limit (Vol)",
        "Held at a limit",
        "Clips high from input",
        "Clips low from input",
      ]) {
        expect(names).toContain(want);
      }
      for (const not of [
        "Output transitions",
        "Chatter",
        "Upper switching point",
        "Period",
        "Duty cycle",
        "Rise time 10–90 %",
      ])
        expect(names).not.toContain(not);
      const series = await page.getByTestId("trace-plot").getAttribute("data-series");
      expect(series).not.toMatch(/measured edges/);
      expect(await page.locator('[data-check="No extra transitions"]').count()).toBe(0);
    } finally {
      await ctx.close();
    }
  });
});

describe("From spec (#16 item 4)", () => {
  it("refuses an upper point below the lower one, naming the field, and disables a proposal that went out of date", async () => {
    const { ctx, page } = await designer();
    try {
      await openWorkbench(page, scenarioId(/battery/i));
      await page.getByRole("tab", { name: "From spec" }).click();
      await page.getByTestId("design-button").click();
      const apply = page.getByTestId("apply-design");
      await apply.waitFor();
      expect(await apply.isDisabled()).toBe(false);
      const lower = parseQuantity((await page.locator('input[name="spec.lower"]').inputValue()).trim())!;
      await typeField(page, "spec.upper", String(lower - 0.5));
      await expect.poll(() => page.locator('[data-parsed="spec.upper"]').textContent()).toMatch(/must be above Lower/);
      await expect.poll(() => apply.isDisabled()).toBe(true);
      await page.getByTestId("proposal-out-of-date").waitFor();
      await page.getByTestId("design-button").click();
      await expect.poll(() => page.getByTestId("fields-at-fault").textContent()).toMatch(/Upper.*must be above Lower/);
    } finally {
      await ctx.close();
    }
  });
});

describe("edits survive leaving the page (#16 item 2)", () => {
  it("asks before a reload or an in-app link, and offers the draft back after the reload", async () => {
    const { ctx, page } = await designer();
    try {
      const id = scenarioId(/battery/i);
      await openWorkbench(page, id);
      await typeField(page, "stage.rFeedback", "820k");
      await page.locator('input[name="stage.rFeedback"]').blur();
      await expect.poll(() => page.getByTestId("run-bar").textContent()).toMatch(/unsaved edits/);
      await page.waitForTimeout(600); // the draft is written 300 ms after the last edit

      // In-app link: the confirm is answered "stay", and the page stays.
      const dialogs: string[] = [];
      page.once("dialog", (d) => {
        dialogs.push(d.type());
        void d.dismiss();
      });
      const link = page.locator("[data-testid=workbench] a[href^='/boards/']").first();
      await link.click();
      await page.waitForTimeout(500);
      expect(dialogs).toEqual(["confirm"]);
      expect(new URL(page.url()).pathname).toBe(`/scenarios/${id}`);

      // Reload: the browser's leave-page prompt comes up; accept it.
      page.once("dialog", (d) => {
        dialogs.push(d.type());
        void d.accept();
      });
      await page.reload();
      await page.getByTestId("run-button").waitFor();
      expect(dialogs).toContain("beforeunload");
      await page.getByTestId("draft-offer").waitFor();
      await page.getByTestId("restore-draft").click();
      await expect.poll(() => page.locator('input[name="stage.rFeedback"]').inputValue()).toBe("820k");
      await expect.poll(() => page.getByTestId("run-bar").textContent()).toMatch(/unsaved edits/);
    } finally {
      await ctx.close();
    }
  });
});

describe("captures (#16 item 7)", () => {
  it("detects a semicolon separator and decimal commas, and says so", async () => {
    const dir = path.join(os.tmpdir(), `railwise-e2e-${process.pid}`);
    mkdirSync(dir, { recursive: true });
    const file = path.join(dir, "float-semicolon.csv");
    writeFileSync(file, "time;volts\n0;1,5\n0,001;2,25\n0,002;3\n0,003;2,5\n");
    const { ctx, page } = await designer();
    try {
      await page.goto(`${server.url}/captures`);
      await page.locator("#capture-file").setInputFiles(file);
      const detected = page.getByTestId("capture-detected");
      await detected.waitFor();
      expect(await detected.textContent()).toMatch(/semicolon-separated, decimal commas/);
      const body = await page.locator("main").textContent();
      expect(body).not.toMatch(/choose a different column/);
      expect(body).not.toMatch(/not a number|not a value/);
    } finally {
      await ctx.close();
    }
  });
});

describe("exports stand on their own (#16 items 8 and 9)", () => {
  it("exports the Trace as a PNG with a heading above the plot, and CSV times at the grid's precision", async () => {
    const ctx = await browser.newContext({ viewport: { width: 1280, height: 900 }, acceptDownloads: true });
    const page = await ctx.newPage();
    try {
      await signInPage(page, server.url, DESIGNER);
      await openWorkbench(page, scenarioId(/hydrophone/i));
      await runAndWait(page);
      const canvasHeight = await page
        .locator("[data-testid=trace-plot] canvas")
        .first()
        .evaluate((c) => (c as HTMLCanvasElement).height);
      const [png] = await Promise.all([
        page.waitForEvent("download"),
        page.getByTestId("trace-plot").getByRole("button", { name: "PNG" }).click(),
      ]);
      const file = await png.path();
      const { readFileSync } = await import("node:fs");
      const bytes = readFileSync(file!);
      // PNG signature and IHDR height (PNG specification, ISO/IEC 15948: IHDR at byte 16, big-endian).
      expect(bytes.subarray(1, 4).toString("latin1")).toBe("PNG");
      const height = bytes.readUInt32BE(20);
      console.log(`[hygiene] trace PNG ${bytes.readUInt32BE(16)} × ${height} px, plot canvas ${canvasHeight} px high`);
      // Title, scenario and run lines, export date, axis units and the legend sit above the plot.
      expect(height - canvasHeight).toBeGreaterThanOrEqual(80);

      const [csv] = await Promise.all([
        page.waitForEvent("download"),
        page.getByTestId("run-bar").getByRole("button", { name: "CSV" }).click(),
      ]);
      const text = readFileSync((await csv.path())!, "utf8");
      const times = text
        .split(/\r?\n/)
        .slice(1, 50)
        .map((l) => l.split(",")[0]);
      // 12,000 points over 12 ms: steps of about 1 µs need ~10 decimals, not 17 digits of binary noise.
      for (const t of times) expect(t.replace(/^-?\d*\.?/, "").length).toBeLessThanOrEqual(10);
      expect(new Set(times).size).toBe(times.length);
    } finally {
      await ctx.close();
    }
  });
});

describe("input rows keep their own text; the saved mark follows the edits (#16 item 10)", () => {
  it("removing a middle row or adding a capture keeps the other rows' text; Save clears the mark, an edit sets it", async () => {
    const { ctx, page } = await designer();
    try {
      await openWorkbench(page, scenarioId(/status-lamp|blinker/i));
      await page.getByRole("tab", { name: "Signal" }).click();
      const panel = page.getByTestId("signal-panel");
      await panel.getByLabel("Component to add").selectOption("dc");
      await panel.getByRole("button", { name: "Add", exact: true }).click();
      await panel.getByRole("button", { name: "Add", exact: true }).click();
      await typeField(page, "input.1.level", "1.25");
      // Text that does not parse never reaches the store: only the row's own field holds it.
      await typeField(page, "input.2.level", "2.5x");
      await panel.getByRole("button", { name: "Remove component 2" }).click();
      const level = (i: number) => page.locator(`input[name="input.${i}.level"]`);
      await expect.poll(() => page.locator('input[name^="input."][name$=".level"]').count()).toBe(2);
      expect(await level(0).inputValue()).toBe("0");
      expect(await level(1).inputValue()).toBe("2.5x");
      expect(await level(1).getAttribute("aria-invalid")).toBe("true");
      // A refused run names the row as well as the field: several rows have a "Level".
      await page.getByTestId("run-button").click();
      await expect.poll(() => page.getByTestId("fields-at-fault").textContent()).toMatch(/Component 2 Level: /);

      // A capture picked from the team's list is added below; the rows above keep their text.
      await panel.getByLabel("Capture").selectOption({ index: 1 });
      await panel.getByRole("button", { name: "Use capture" }).click();
      await expect.poll(() => panel.getByText(/measured samples from/).count()).toBe(1);
      expect(await level(1).inputValue()).toBe("2.5x");

      // Saved: the mark clears; the next edit sets it again.
      await typeField(page, "input.1.level", "1.5");
      await expect.poll(() => page.getByTestId("save-state").textContent()).toBe("unsaved edits");
      await page.getByTestId("save-button").click();
      await expect.poll(() => page.getByTestId("save-state").textContent(), { timeout: 15_000 }).toBe("saved");
      await expect.poll(() => page.getByTestId("workbench-notice").textContent()).toMatch(/Saved as version/);
      await typeField(page, "input.0.level", "0.1");
      await expect.poll(() => page.getByTestId("save-state").textContent()).toBe("unsaved edits");
    } finally {
      await ctx.close();
    }
  });
});

describe("messages use the labels on the screen (#16 item 6)", () => {
  /** A camelCase word or a dotted path: what a code field name looks like. */
  const CODE_NAME = /\b[a-z]+[A-Z]\w*\b|\b[a-z]+\.[a-z]+\b/;

  it("names the fields of a refused run and of the study forms by their labels, and says where the spec window came from", async () => {
    const { ctx, page } = await designer();
    try {
      await openWorkbench(page, scenarioId(/battery/i));
      // Each headroom is valid alone; together they exceed the 5 V supply (a rule of the contract).
      const high = page.locator('input[name="opamp.outputHeadroomHigh"]');
      const low = page.locator('input[name="opamp.outputHeadroomLow"]');
      const [highWas, lowWas] = [await high.inputValue(), await low.inputValue()];
      await high.fill("3");
      await low.fill("3");
      await page.getByTestId("run-button").click();
      const alert = page.locator("[data-testid=run-bar] [role=alert]");
      await expect.poll(() => alert.textContent()).toMatch(/“Headroom V\+” \+ “Headroom V−” \(6 V\) must be smaller/);
      expect(await alert.textContent()).not.toMatch(CODE_NAME);
      await high.fill(highWas);
      await low.fill(lowWas);

      const card = page.getByTestId("studies-card");
      await card.waitFor({ timeout: 60_000 });
      const form = page.getByTestId("noise-form");
      // Order of two fields: the form's own labels.
      await form.locator('input[name="noise-rms-from"]').fill("1");
      await expect
        .poll(() => form.getByTestId("study-form-problem").textContent())
        .toBe("“rms to” must be above “rms from”");
      await form.locator('input[name="noise-rms-from"]').fill("1m");
      // A count past its bound: refused by the field itself, listed by its label when Run study is pressed.
      await form.locator('input[name="noise-seeds"]').fill("20000");
      await expect.poll(() => form.locator('[data-parsed="noise-seeds"]').textContent()).toMatch(/1 … 10,000/);
      await form.locator('input[name="noise-limit"]').fill("150");
      await expect.poll(() => form.locator('[data-parsed="noise-limit"]').textContent()).toMatch(/below 100 %/);
      await page.getByTestId("run-noise-study").click();
      const fields = page.getByTestId("fields-at-fault");
      await expect.poll(() => fields.textContent()).toMatch(/seeds per level: a whole number 1 … 10,000/);
      const listed = await fields.textContent();
      expect(listed).toMatch(/chatter limit: above 0 % and below 100 %/);
      expect(listed).not.toMatch(CODE_NAME);

      await card.getByRole("tab", { name: "Tolerance spread" }).click();
      await expect
        .poll(() => page.getByTestId("spec-window-source").textContent())
        .toMatch(/±2 % around each figure designed from this stage's parts/);
    } finally {
      await ctx.close();
    }
  });
});

// End to end in real Chromium against the real server (fresh SQLite, seeded demo data):
// sign-in page, boards, the board's scenario table, a scenario's tables, create/rename/delete
// through the dialogs, and the read-only view of a viewer. Screenshots go to
// test-output/screenshots/ so a person can look at them.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, BrowserContext, Page } from "playwright-core";
import { launchBrowser, screenshot, signInPage } from "@/tests/helpers/browser";
import { startServer, type TestServer } from "@/tests/helpers/server";
import { DEMO_BOARD, DEMO_SCENARIOS } from "@/lib/demo/scenarios";
import { formatQuantity, parseQuantity } from "@/lib/design/notation";

const DESIGNER = "designer@fjordline.example";
const VIEWER = "viewer@fjordline.example";
const BATTERY = "Battery low-voltage disconnect";
// The battery demo's feedback resistor (lib/demo/scenarios.ts): 680 kΩ.
const BATTERY_R_FEEDBACK = 680e3;

const DESKTOP = { width: 1366, height: 900 };
const PHONE = { width: 390, height: 844 };

let server: TestServer;
let browser: Browser;

beforeAll(async () => {
  server = await startServer();
  browser = await launchBrowser();
});

afterAll(async () => {
  await browser?.close();
  await server?.stop();
});

async function newPage(viewport = DESKTOP): Promise<{ context: BrowserContext; page: Page }> {
  const context = await browser.newContext({ viewport, deviceScaleFactor: 1 });
  const page = await context.newPage();
  return { context, page };
}

async function openBoard(page: Page) {
  await page.getByRole("link", { name: new RegExp(DEMO_BOARD.name) }).click();
  await page.waitForURL(/\/boards\/[^/]+$/);
  await page.getByTestId("scenario-table").waitFor();
}

describe("foundation pages in Chromium", () => {
  it("redirects a visitor without a session to the sign-in page, which lists the demo accounts", async () => {
    const { context, page } = await newPage();
    await page.goto(`${server.url}/boards`);
    await page.waitForURL(/\/signin/);
    await expect(page.getByRole("heading", { name: "Sign in to your team" }).isVisible()).resolves.toBe(true);
    const demo = page.getByTestId("demo-accounts");
    await expect(demo.textContent()).resolves.toContain(DESIGNER);
    // One click fills both fields.
    await demo.getByRole("button", { name: `Use ${VIEWER} ` }).click();
    await expect(page.locator("#email").inputValue()).resolves.toBe(VIEWER);
    await expect(page.locator("#password").inputValue()).resolves.not.toBe("");
    await screenshot(page, "foundation-signin");
    await page.setViewportSize(PHONE);
    await screenshot(page, "foundation-signin-phone");
    await context.close();
  });

  it("refuses a wrong password with a message and stays on the sign-in page", async () => {
    const { context, page } = await newPage();
    await page.goto(`${server.url}/signin`);
    await page.locator("#email").fill(DESIGNER);
    await page.locator("#password").fill("not-the-password");
    await page.getByRole("button", { name: "Sign in", exact: true }).click();
    // (Next also renders an empty role=alert route announcer, so look inside the form.)
    await page.locator("form [role=alert]", { hasText: /do not match/ }).waitFor();
    expect(new URL(page.url()).pathname).toBe("/signin");
    await context.close();
  });

  it("designer: boards → board table with the five demo scenarios → a scenario with its resistor values", async () => {
    const { context, page } = await newPage();
    await signInPage(page, server.url, DESIGNER);
    expect(new URL(page.url()).pathname).toBe("/boards");
    const header = page.locator("header").first();
    await expect(header.textContent()).resolves.toContain("Fjordline Aquaculture");
    await expect(header.textContent()).resolves.toContain("designer");
    await page.getByTestId("board-list").waitFor();
    await screenshot(page, "foundation-boards");

    await openBoard(page);
    const table = page.getByTestId("scenario-table");
    const rows = table.locator("tbody tr");
    await expect(rows.count()).resolves.toBe(DEMO_SCENARIOS.length);
    const text = (await table.textContent()) ?? "";
    for (const s of DEMO_SCENARIOS) expect(text).toContain(s.name);
    // Editors see the create and per-row actions.
    await expect(page.getByRole("button", { name: "New scenario" }).isVisible()).resolves.toBe(true);
    await expect(page.getByRole("button", { name: `Rename ${BATTERY}` }).isVisible()).resolves.toBe(true);
    await screenshot(page, "foundation-board");
    await page.setViewportSize(PHONE);
    await page.getByTestId("scenario-list").waitFor();
    await screenshot(page, "foundation-board-designer-phone");
    await page.setViewportSize(DESKTOP);

    await page.getByRole("link", { name: BATTERY, exact: true }).click();
    await page.waitForURL(/\/scenarios\/[^/]+$/);
    await page.getByRole("heading", { name: BATTERY, level: 1 }).waitFor();
    // The value shows as a formatted quantity (tables) or as a typed value (workbench).
    await expect.poll(async () => resistorShown(page, BATTERY_R_FEEDBACK), { timeout: 15_000 }).toBe(true);
    // A battery disconnect switches a load: the caution is on the page.
    await expect(page.getByTestId("safety-caution").textContent()).resolves.toMatch(
      /local electrical codes and licensed practice/,
    );
    await screenshot(page, "foundation-scenario-designer");
    await context.close();
  });

  it("designer: creates a scenario from a blank stage, renames it and deletes it", async () => {
    const { context, page } = await newPage();
    await signInPage(page, server.url, DESIGNER);
    await openBoard(page);
    const boardUrl = page.url();

    await page.getByRole("button", { name: "New scenario" }).click();
    const dialog = page.getByRole("dialog", { name: "New scenario" });
    // An empty name is refused inside the dialog, naming the field.
    await dialog.getByRole("button", { name: "Create scenario" }).click();
    await expect(dialog.getByRole("alert").textContent()).resolves.toMatch(/^Name:/);
    await dialog.getByLabel("Name").fill("Pump dry-run cut-out");
    await dialog.getByLabel("Start from").selectOption("blank:comparator");
    await screenshot(page, "foundation-new-scenario-dialog");
    await dialog.getByRole("button", { name: "Create scenario" }).click();
    await page.waitForURL(/\/scenarios\/[^/]+$/);
    await page.getByRole("heading", { name: "Pump dry-run cut-out", level: 1 }).waitFor();

    await page.goto(boardUrl);
    await page.getByTestId("scenario-table").waitFor();
    await expect(page.getByTestId("scenario-table").textContent()).resolves.toContain("Pump dry-run cut-out");

    await page.getByRole("button", { name: "Rename Pump dry-run cut-out" }).click();
    const rename = page.getByRole("dialog", { name: "Rename scenario" });
    await rename.getByLabel("Name").fill("Pump dry-run cut-out, pen 2");
    await rename.getByRole("button", { name: "Rename" }).click();
    await page.getByRole("link", { name: "Pump dry-run cut-out, pen 2", exact: true }).waitFor();
    const row = page.locator("tbody tr", { hasText: "Pump dry-run cut-out, pen 2" });
    await expect(row.textContent()).resolves.toContain("v2");

    await page.getByRole("button", { name: "Delete Pump dry-run cut-out, pen 2" }).click();
    await page.getByRole("dialog", { name: "Delete scenario?" }).getByRole("button", { name: "Delete" }).click();
    await expect
      .poll(async () => page.locator("tbody tr", { hasText: "Pump dry-run cut-out" }).count(), { timeout: 10_000 })
      .toBe(0);
    await expect(page.locator("tbody tr").count()).resolves.toBe(DEMO_SCENARIOS.length);
    await context.close();
  });

  it("viewer: reads the board and the scenario tables with no edit controls", async () => {
    const { context, page } = await newPage();
    await signInPage(page, server.url, VIEWER);
    await expect(page.locator("header").first().textContent()).resolves.toContain("viewer");
    await expect(page.getByRole("button", { name: "New board" }).count()).resolves.toBe(0);
    await openBoard(page);
    await expect(page.getByRole("button", { name: /New scenario|^Rename |^Delete / }).count()).resolves.toBe(0);
    await expect(page.locator("tbody tr").count()).resolves.toBe(DEMO_SCENARIOS.length);

    await page.getByRole("link", { name: BATTERY, exact: true }).click();
    await page.waitForURL(/\/scenarios\/[^/]+$/);
    const tables = page.getByTestId("scenario-tables");
    await tables.waitFor();
    const text = (await tables.textContent()) ?? "";
    // Resistor roles in engineering units and the part profile in friendly units.
    expect(text).toContain(formatQuantity(BATTERY_R_FEEDBACK, "Ω", 4)); // "680 kΩ"
    expect(text).toContain(formatQuantity(33e3, "Ω", 4)); // rReference "33 kΩ"
    expect(text).toContain("V/µs");
    expect(text).toContain("Schmitt trigger, inverting");
    // Designed switching points at the divider: inverting-trigger closed form (tests/REFERENCES.md),
    // upper = (Vref·rFb + Voh·rRef)/(rRef + rFb) + Vos = 2.6153 V, lower with Vol = 2.3857 V
    // (Vref 2.5 V, rRef 33 kΩ, rFb 680 kΩ, Voh 4.98 V, Vol 0.02 V, Vos 0.5 mV; worked by hand).
    expect(text).toContain("2.615 V");
    expect(text).toContain("2.386 V");
    expect(text).toContain("Deadband");
    // No form controls a viewer could type into, and no save/run buttons.
    await expect(page.locator("main input, main select, main textarea").count()).resolves.toBe(0);
    await expect(page.getByRole("button", { name: /save|run|delete|rename/i }).count()).resolves.toBe(0);
    await screenshot(page, "foundation-scenario-viewer");

    await page.setViewportSize(PHONE);
    await screenshot(page, "foundation-scenario-viewer-phone");
    await page.goBack();
    // Phones get the stacked list instead of the table, with the same five scenarios.
    await page.getByTestId("scenario-list").waitFor();
    await expect(page.getByTestId("scenario-list").locator("li").count()).resolves.toBe(DEMO_SCENARIOS.length);
    await expect(page.getByTestId("scenario-table").isVisible()).resolves.toBe(false);
    await screenshot(page, "foundation-board-phone");
    // Header with the full nav at a tablet width: one row, nothing clipped.
    await page.setViewportSize({ width: 820, height: 700 });
    const box = await page.locator("header").first().boundingBox();
    expect(box?.height ?? 0).toBeLessThan(110);
    await screenshot(page, "foundation-board-tablet");
    await context.close();
  });

  it("viewer: the safety caution shows on the battery disconnect but not on the hydrophone preamp", async () => {
    const { context, page } = await newPage();
    await signInPage(page, server.url, VIEWER);
    await openBoard(page);
    const boardUrl = page.url();
    await page.getByRole("link", { name: BATTERY, exact: true }).click();
    await page.getByTestId("scenario-tables").waitFor();
    await expect(page.getByTestId("safety-caution").count()).resolves.toBe(1);
    await page.goto(boardUrl);
    await page.getByRole("link", { name: "Hydrophone preamp", exact: true }).click();
    await page.getByTestId("scenario-tables").waitFor();
    await expect(page.getByTestId("scenario-tables").textContent()).resolves.toContain("Non-inverting amplifier");
    await expect(page.getByTestId("safety-caution").count()).resolves.toBe(0);
    await context.close();
  });

  it("owner creates a board; a designer has no New board button", async () => {
    const { context, page } = await newPage();
    await signInPage(page, server.url, "owner@fjordline.example");
    await page.getByRole("button", { name: "New board" }).click();
    const dialog = page.getByRole("dialog", { name: "New board" });
    await dialog.getByLabel("Name").fill("Feed barge controller");
    await dialog.getByLabel("Description").fill("Auger motor over-current flag and hopper level switch.");
    await dialog.getByRole("button", { name: "Create board" }).click();
    await page.getByRole("link", { name: /Feed barge controller/ }).waitFor();
    await expect(page.getByTestId("board-list").locator("li").count()).resolves.toBe(2);
    await screenshot(page, "foundation-boards-owner");
    // The new board opens with an empty state that invites the first scenario.
    await page.getByRole("link", { name: /Feed barge controller/ }).click();
    await page.getByText("No scenarios on this board").waitFor();
    await context.close();

    const designer = await newPage();
    await signInPage(designer.page, server.url, DESIGNER);
    await designer.page.getByTestId("board-list").waitFor();
    await expect(designer.page.getByRole("button", { name: "New board" }).count()).resolves.toBe(0);
    await designer.context.close();
  });

  it("signs out from the header through the sign-out page", async () => {
    const { context, page } = await newPage();
    await signInPage(page, server.url, VIEWER);
    await page.getByRole("link", { name: "Sign out" }).click();
    await page.waitForURL(/\/signout$/);
    await screenshot(page, "foundation-signout");
    await page.getByRole("button", { name: "Sign out" }).click();
    await page.waitForURL(/\/signin/);
    // The session is gone: a signed-in page sends us back to sign in.
    await page.goto(`${server.url}/boards`);
    await page.waitForURL(/\/signin/);
    await context.close();
  });

  it("answers an unknown scenario id with our not-found state, not an error page", async () => {
    const { context, page } = await newPage();
    await signInPage(page, server.url, VIEWER);
    await page.goto(`${server.url}/scenarios/does-not-exist`);
    await page.getByText("Scenario not found").waitFor();
    await context.close();
  });
});

/** True when the page shows `ohms` as a formatted quantity (680 kΩ), an RKM code (680K) or a typed value. */
async function resistorShown(page: Page, ohms: number): Promise<boolean> {
  const shown = formatQuantity(ohms, "Ω", 4);
  const body = await page.locator("main").innerText();
  if (body.includes(shown)) return true;
  const values = await page.locator("main input").evaluateAll((els) => els.map((e) => (e as HTMLInputElement).value));
  return values.some((v) => parseQuantity(v) === ohms);
}

describe("a deployment that hides the demo accounts (RAILWISE_HIDE_DEMO=1)", () => {
  let hidden: TestServer;
  beforeAll(async () => {
    hidden = await startServer({ env: { RAILWISE_HIDE_DEMO: "1" } });
  });
  afterAll(async () => {
    await hidden?.stop();
  });

  it("shows the sign-in form without the demo list or password", async () => {
    const { context, page } = await newPage();
    await page.goto(`${hidden.url}/signin`);
    await page.locator("#email").waitFor();
    await expect(page.getByTestId("demo-accounts").count()).resolves.toBe(0);
    await expect(page.locator("body").innerText()).resolves.not.toContain("railwise-demo");
    await context.close();
  });
});

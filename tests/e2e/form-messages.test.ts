// End to end in real Chromium (#16 item 6): the part profile, invitation, member role, board and
// scenario forms answer a bad input with a message that uses the label on the screen — never the
// contract's field name (openLoopGain, email …) — and store nothing. Screenshots of each refusal
// go to test-output/screenshots/forms-*.png.
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { launchBrowser, screenshot, signInPage } from "@/tests/helpers/browser";
import { signIn, startServer, type SignedIn, type TestServer } from "@/tests/helpers/server";
import { DEMO_PASSWORD } from "@/lib/demo/accounts";
import { EMAILS, firstScenarioId } from "@/tests/helpers/team";
import { OPAMP_PARAMS } from "@/lib/schemas/part";

let server: TestServer;
let browser: Browser;
let owner: SignedIn;

/** Contract names a user never sees on a form. */
const CODE_NAMES = new RegExp(`\\b(${[...OPAMP_PARAMS, "email", "boardId", "scenarioId"].join("|")})\\b`);

beforeAll(async () => {
  server = await startServer();
  browser = await launchBrowser();
  owner = await signIn(server.url, EMAILS.owner, DEMO_PASSWORD);
});
afterAll(async () => {
  await browser?.close();
  await server?.stop();
});

async function pageAs(role: keyof typeof EMAILS): Promise<Page> {
  const ctx = await browser.newContext({ viewport: { width: 1280, height: 900 } });
  const page = await ctx.newPage();
  await signInPage(page, server.url, EMAILS[role]);
  return page;
}

async function count(path: string): Promise<number> {
  const res = await owner.fetch(path);
  expect(res.status).toBe(200);
  return ((await res.json()) as { items: unknown[] }).items.length;
}

/** Every alert text inside `scope` (field messages and form messages). */
async function alerts(page: Page, scope: string): Promise<string[]> {
  return page.locator(`${scope} [role=alert]`).allInnerTexts();
}

describe("form messages in screen words", () => {
  it("part profile: bad values are named by their labels, in the unit typed, and nothing is stored", async () => {
    const page = await pageAs("designer");
    const before = await count("/api/parts");
    await page.goto(`${server.url}/parts`);
    await page.getByRole("table", { name: "Part profiles" }).waitFor();
    await page.getByRole("button", { name: "New profile" }).click();
    await page.getByLabel("Name").fill("bad values");
    await page.getByLabel("Open-loop gain (V/V)").fill("0.5");
    await page.getByLabel("Gain-bandwidth (Hz)").fill("fast");
    await page.getByLabel("Slew rate (rising) (V/µs)").fill("2meg");
    await page.getByLabel("Headroom to V+ (V)").fill("-10m");
    await page.getByLabel("Headroom to V− (V)").fill("10m");
    await page.getByLabel("Input offset (V)").fill("");
    await page.getByRole("button", { name: "Save" }).click();
    await page.locator("#part-gainBandwidth-error").waitFor();
    const texts = await alerts(page, "dialog");
    await screenshot(page, "forms-part-profile");
    // Each message starts with the label printed above its field.
    expect(await page.locator("#part-openLoopGain-error").innerText()).toBe("Open-loop gain must be at least 1 V/V");
    expect(await page.locator("#part-gainBandwidth-error").innerText()).toMatch(
      /^Gain-bandwidth: “fast” is not a value/,
    );
    expect(await page.locator("#part-slewRate-error").innerText()).toMatch(/^Slew rate \(rising\): write M for mega/);
    expect(await page.locator("#part-outputHeadroomHigh-error").innerText()).toBe(
      "Headroom to V+ must not be negative",
    );
    expect(await page.locator("#part-inputOffset-error").innerText()).toBe("Input offset is required");
    for (const t of texts) expect(t, "no contract name in a message").not.toMatch(CODE_NAMES);
    // A limit is said in the unit the field is typed in (V/µs), not the stored SI unit (V/s).
    await page.getByLabel("Open-loop gain (V/V)").fill("100k");
    await page.getByLabel("Gain-bandwidth (Hz)").fill("1M");
    await page.getByLabel("Slew rate (rising) (V/µs)").fill("5M");
    await page.getByLabel("Headroom to V+ (V)").fill("10m");
    await page.getByLabel("Input offset (V)").fill("1m");
    await page.getByRole("button", { name: "Save" }).click();
    await page.locator("#part-slewRate-error").waitFor();
    expect(await page.locator("#part-slewRate-error").innerText()).toBe(
      "Slew rate (rising) must be at most 1,000,000 V/µs",
    );
    expect(await count("/api/parts")).toBe(before);
    await page.context().close();
  });

  it("invitation: an address that is not one is refused beside the E-mail field; nothing is sent", async () => {
    const page = await pageAs("owner");
    const before = await count("/api/team/invitations");
    await page.goto(`${server.url}/team`);
    // Empty: the button is not disabled without a reason; pressing it says what is missing.
    const send = page.getByRole("button", { name: "Send invitation" });
    expect(await send.isEnabled()).toBe(true);
    await send.click();
    const message = page.locator("#invite-email-error");
    await message.waitFor();
    expect(await message.innerText()).toBe("Enter the e-mail address of the person to invite.");
    await page.getByLabel("E-mail", { exact: true }).fill("rita.field-at-fjordline");
    await send.click();
    await expect
      .poll(() => message.innerText())
      .toBe("E-mail must be an e-mail address, such as name@company.example.");
    await screenshot(page, "forms-invitation");
    expect(await message.innerText()).toBe("E-mail must be an e-mail address, such as name@company.example.");
    // The field at fault has the focus, and no invitation was made.
    expect(await page.evaluate(() => document.activeElement?.id)).toBe("invite-email");
    expect(await count("/api/team/invitations")).toBe(before);
    await page.context().close();
  });

  it("member role: the only owner cannot be demoted; the message says why and the role stays", async () => {
    const page = await pageAs("owner");
    await page.goto(`${server.url}/team`);
    const select = page.getByLabel("Role of Sigrid Holm");
    await select.selectOption("designer");
    const alert = page.locator("main p[role=alert]");
    await alert.waitFor();
    expect(await alert.innerText()).toMatch(/team's only owner/);
    expect(await alert.innerText()).not.toMatch(/\brole\b:/);
    await expect.poll(() => select.inputValue()).toBe("owner");
    const members = (await (await owner.fetch("/api/team/members")).json()) as {
      items: { email: string; role: string }[];
    };
    expect(members.items.find((m) => m.email === EMAILS.owner)?.role).toBe("owner");
    await page.context().close();
  });

  it("board and scenario: a blank name is refused naming the Name field; nothing is created", async () => {
    const page = await pageAs("owner");
    const boardsBefore = await count("/api/boards");
    await page.goto(`${server.url}/boards`);
    await page.getByTestId("board-list").waitFor();
    await page.getByRole("button", { name: "New board" }).first().click();
    await page.getByLabel("Name").fill("   ");
    await page.getByRole("button", { name: "Create board" }).click();
    const boardAlert = page.locator("dialog [role=alert]");
    await boardAlert.waitFor();
    expect(await boardAlert.innerText()).toBe("Name: give the board a name.");
    await screenshot(page, "forms-board");
    expect(await count("/api/boards")).toBe(boardsBefore);

    const scenarioId = await firstScenarioId(owner);
    const { boardId } = (await (await owner.fetch(`/api/scenarios/${scenarioId}`)).json()) as { boardId: string };
    const scenariosBefore = await count(`/api/scenarios?boardId=${boardId}`);
    await page.goto(`${server.url}/boards/${boardId}`);
    await page.getByRole("button", { name: "New scenario" }).first().click();
    await page.getByRole("button", { name: "Create scenario" }).click();
    const scenarioAlert = page.locator("dialog [role=alert]");
    await scenarioAlert.waitFor();
    expect(await scenarioAlert.innerText()).toBe("Name: give the scenario a name.");
    await screenshot(page, "forms-scenario");
    expect(await count(`/api/scenarios?boardId=${boardId}`)).toBe(scenariosBefore);
    await page.context().close();
  });
});

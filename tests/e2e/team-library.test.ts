// End to end in headless Chromium: an invitee joins from the mailed link and lands signed in;
// a designer uploads a capture (column choice + preview) and adds a part profile. Screenshots
// of the invitation, captures and parts pages go to test-output/screenshots/.
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { launchBrowser, screenshot, signInPage } from "@/tests/helpers/browser";
import { startServer, type TestServer } from "@/tests/helpers/server";
import { waitForMail } from "@/tests/helpers/team";

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

describe("team library and invitations in the browser", () => {
  it("an invitee follows the mailed link, sets a password and is signed in", async () => {
    const ownerContext = await browser.newContext({ viewport: { width: 1280, height: 860 } });
    const owner = await ownerContext.newPage();
    await signInPage(owner, server.url, "owner@fjordline.example");
    await owner.goto(`${server.url}/team`);
    await owner.getByLabel("E-mail", { exact: true }).fill("rita.field@fjordline.example");
    await owner.getByLabel("Role", { exact: true }).selectOption("designer");
    await owner.getByRole("button", { name: "Send invitation" }).click();
    await owner.getByText("Invitation sent to rita.field@fjordline.example.").waitFor();

    const mail = await waitForMail(server.mailDir, (m) => m.to.includes("rita.field@fjordline.example"));
    const link = /https?:\/\/\S+\/invite\/[A-Za-z0-9_-]+/.exec(mail.text)![0];

    // The mailbox page shows the same mail to the owner (local sink, production build).
    await owner.goto(`${server.url}/dev/mail`);
    await owner.getByText("Sigrid Holm invited you to Fjordline Aquaculture on Railwise").first().click();
    await owner.getByRole("link", { name: link }).waitFor();
    await screenshot(owner, "team-mailbox");

    const inviteeContext = await browser.newContext({ viewport: { width: 1280, height: 860 } });
    const invitee = await inviteeContext.newPage();
    await invitee.goto(link);
    await invitee.getByRole("heading", { name: "Join Fjordline Aquaculture" }).waitFor();
    await invitee.getByLabel("Your name").fill("Rita Field");
    await invitee.getByLabel("Choose a password").fill("kelp-forest-42");
    await invitee.getByLabel("Repeat the password").fill("kelp-forest-42");
    await screenshot(invitee, "team-invite");
    await invitee.getByRole("button", { name: "Join the team" }).click();
    await invitee.waitForURL((u) => u.pathname.startsWith("/boards"), { timeout: 30_000 });
    await invitee.getByText("Rita Field").first().waitFor();

    // The link is used up.
    await invitee.goto(link);
    await invitee.getByRole("heading", { name: "This invitation cannot be used" }).waitFor();
    expect(await invitee.locator("section [role=alert]").textContent()).toMatch(/already been used/);
    await inviteeContext.close();
    await ownerContext.close();
  });

  it("a designer uploads a capture with chosen columns and adds a part profile", async () => {
    const context = await browser.newContext({ viewport: { width: 1280, height: 860 } });
    const page = await context.newPage();
    const errors: string[] = [];
    page.on("pageerror", (e) => errors.push(String(e)));
    await signInPage(page, server.url, "designer@fjordline.example");

    await page.goto(`${server.url}/captures`);
    // A float switch that bounces: 2 ms samples, the level in the third column.
    const rows = ["time_ms,supply_v,float_v"];
    for (let i = 0; i <= 400; i++) {
      const t = i * 2;
      const level = t < 300 ? 0.1 : t < 320 ? (i % 2 ? 3.2 : 0.3) : 3.25;
      rows.push(`${t},12.1,${level.toFixed(3)}`);
    }
    await page
      .locator("#capture-file")
      .setInputFiles({ name: "float-pen2.csv", mimeType: "text/csv", buffer: Buffer.from(rows.join("\n")) });
    await page.getByRole("table", { name: "First rows of the file" }).waitFor();
    await page.getByLabel("Volts column").selectOption({ label: "float_v" });
    await expect.poll(() => page.getByLabel("Time unit").inputValue()).toBe("ms");
    await page.getByRole("img", { name: "Preview of float-pen2" }).waitFor();
    await screenshot(page, "team-captures-upload");
    await page.getByRole("button", { name: "Store capture" }).click();
    await page.getByText('Stored "float-pen2" (401 points).').waitFor();
    const row = page.getByRole("table", { name: "Captures" }).getByRole("row", { name: /float-pen2/ });
    await row.waitFor();
    expect(await row.textContent()).toContain("800 ms");
    await row.getByRole("button", { name: "Preview" }).click();
    await page.getByRole("img", { name: "Capture float-pen2" }).waitFor();
    await screenshot(page, "team-captures");

    // The stored capture becomes a capture component of a scenario's input signal.
    const boards = (await (await page.request.get(`${server.url}/api/boards`)).json()) as { items: { id: string }[] };
    const list = (await (
      await page.request.get(`${server.url}/api/scenarios?boardId=${boards.items[0].id}`)
    ).json()) as { items: { id: string; name: string }[] };
    const hydrophone = list.items.find((x) => x.name === "Hydrophone preamp")!;
    await page.goto(`${server.url}/scenarios/${hydrophone.id}`);
    await page.getByRole("tab", { name: "Signal" }).click();
    const panel = page.getByTestId("signal-panel");
    const before = await panel.getByText("Capture (uploaded)").count();
    await panel.getByLabel("Capture", { exact: true }).selectOption({ label: "float-pen2 · 401 pts · 800 ms" });
    await panel.getByRole("button", { name: "Use capture" }).click();
    await expect.poll(() => panel.getByText("Capture (uploaded)").count()).toBe(before + 1);
    await panel.getByText("401 measured samples from 0 s to 800 ms").waitFor();

    await page.goto(`${server.url}/parts`);
    await page.getByRole("table", { name: "Part profiles" }).waitFor();
    await page.getByRole("button", { name: "New profile" }).click();
    await page.getByLabel("Name").fill("low-power CMOS 100 kHz");
    await page.getByLabel("Open-loop gain (V/V)").fill("100k");
    await page.getByLabel("Gain-bandwidth (Hz)").fill("100k");
    await page.getByLabel("Slew rate (rising) (V/µs)").fill("0.05");
    await page.getByLabel("Headroom to V+ (V)").fill("10m");
    await page.getByLabel("Headroom to V− (V)").fill("10m");
    await page.getByLabel("Input offset (V)").fill("-3");
    await page.getByRole("button", { name: "Save" }).click();
    // The form names the field by its label (not the contract's "inputOffset") and keeps the dialog open.
    await page.getByText("Input offset must be within ±1 V").waitFor();
    await page.getByLabel("Input offset (V)").fill("3m");
    await page.getByRole("button", { name: "Save" }).click();
    const part = page
      .getByRole("table", { name: "Part profiles" })
      .getByRole("row", { name: /low-power CMOS 100 kHz/ });
    await part.waitFor();
    expect(await part.textContent()).toContain("0.05 V/µs");
    await screenshot(page, "team-parts");
    expect(errors).toEqual([]);
    await context.close();
  });
});

// End to end in headless Chromium: a designer shares a run; the reviewer opens the shared link
// without a session, signs in from it, lands on the run and signs it off; the owner sees the
// decision on the board and in the team's audit log. Screenshots of the shared run page, the
// run page with its review panel, and the team page go to test-output/screenshots/.
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { launchBrowser, screenshot, signInPage } from "@/tests/helpers/browser";
import { signIn, startServer, type TestServer } from "@/tests/helpers/server";
import { DEMO_PASSWORD } from "@/lib/demo/accounts";
import { createRun, firstScenarioId } from "@/tests/helpers/team";

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

describe("review from a shared link", () => {
  it("reviewer signs off a run reached from the shared link", async () => {
    const designer = await signIn(server.url, "designer@fjordline.example", DEMO_PASSWORD);
    const scenarioId = await firstScenarioId(designer, "Battery low-voltage disconnect");
    const runId = await createRun(designer, scenarioId, "Cut-off check before layout");
    const linkRes = await designer.fetch(`/api/runs/${runId}/links`, { method: "POST", body: JSON.stringify({ expiresInDays: 7 }) });
    expect(linkRes.status).toBe(201);
    const { token } = (await linkRes.json()) as { token: string };

    const context = await browser.newContext({ viewport: { width: 1360, height: 900 } });
    const page = await context.newPage();
    const errors: string[] = [];
    page.on("pageerror", (e) => errors.push(String(e)));

    // 1. The link, without a session: the run only.
    await page.goto(`${server.url}/share/${token}`);
    await page.getByTestId("run-view").waitFor();
    await expect.poll(() => page.getByTestId("run-title").textContent()).toBe("Cut-off check before layout");
    expect(await page.getByText("Read-only run link").count()).toBe(1);
    // Nothing of the team: no header navigation, no member names.
    expect(await page.getByRole("navigation", { name: "Main" }).count()).toBe(0);
    expect(await page.content()).not.toContain("Tomas Berge");
    await page.waitForTimeout(500); // let uPlot draw before the picture
    await screenshot(page, "team-shared-run");

    // 2. From the link to sign-in, and on to the run itself.
    await page.getByRole("link", { name: "Team member? Sign in to review" }).click();
    await page.waitForURL(/\/signin/);
    await page.locator("#email").fill("reviewer@fjordline.example");
    await page.locator("#password").fill(DEMO_PASSWORD);
    await page.getByRole("button", { name: "Sign in", exact: true }).click();
    await page.waitForURL((u) => u.pathname === `/runs/${runId}`, { timeout: 30_000 });
    await page.getByTestId("review-panel").waitFor();
    await expect.poll(() => page.getByTestId("review-state").textContent()).toContain("Awaiting review");
    // A reviewer comments and signs off, but does not get the link controls.
    expect(await page.getByRole("button", { name: "Create link" }).count()).toBe(0);

    await page.getByPlaceholder("Plain text; say what you checked and what you saw.").fill("Cut at 11.4 V and reconnect at 12.5 V match the spec.");
    await page.getByRole("button", { name: "Post comment" }).click();
    await page.getByText("Cut at 11.4 V and reconnect at 12.5 V match the spec.").waitFor();

    await page.getByLabel("Approve", { exact: true }).check();
    await page.getByLabel("Note", { exact: true }).fill("Approved for layout.");
    await page.getByRole("button", { name: "Sign off" }).click();
    await expect.poll(() => page.getByTestId("review-state").textContent(), { timeout: 10_000 }).toContain("Approved");
    await expect.poll(() => page.getByTestId("run-review-state").textContent()).toContain("Approved");
    await page.waitForTimeout(300);
    await screenshot(page, "team-run-review");

    // The decision reached the server and the designer's mailbox.
    const signoffs = (await (await designer.fetch(`/api/runs/${runId}/signoffs`)).json()) as { items: { decision: string; note: string; reviewer: { name: string } }[] };
    expect(signoffs.items[0]).toMatchObject({ decision: "approved", note: "Approved for layout.", reviewer: { name: "Maren Lie" } });

    // 3. The owner's view: the team page (members, invitations, audit log).
    const ownerContext = await browser.newContext({ viewport: { width: 1360, height: 900 } });
    const ownerPage = await ownerContext.newPage();
    ownerPage.on("pageerror", (e) => errors.push(String(e)));
    await signInPage(ownerPage, server.url, "owner@fjordline.example");
    await ownerPage.goto(`${server.url}/team`);
    await ownerPage.getByRole("table", { name: "Members" }).waitFor();
    await ownerPage.getByLabel("E-mail", { exact: true }).fill("new.tech@fjordline.example");
    await ownerPage.getByLabel("Role", { exact: true }).selectOption("viewer");
    await ownerPage.getByRole("button", { name: "Send invitation" }).click();
    await ownerPage.getByText("Invitation sent to new.tech@fjordline.example.").waitFor();
    await ownerPage.getByRole("table", { name: "Pending invitations" }).getByText("new.tech@fjordline.example").waitFor();
    await ownerPage.getByRole("table", { name: "Audit log" }).getByText("signed off a run").first().waitFor();
    expect(await ownerPage.getByRole("table", { name: "Members" }).locator("tbody tr").count()).toBe(4);
    await screenshot(ownerPage, "team-page");

    // The board's scenario table shows the latest decision.
    const boards = (await (await designer.fetch("/api/boards")).json()) as { items: { id: string }[] };
    await ownerPage.goto(`${server.url}/boards/${boards.items[0].id}`);
    // The board view has a phone layout too (hidden at this width): look for the visible badge.
    await ownerPage.getByText(/^approved$/i).filter({ visible: true }).first().waitFor();
    await screenshot(ownerPage, "team-board-decision");

    expect(errors).toEqual([]);
    await ownerContext.close();
    await context.close();
  });
});

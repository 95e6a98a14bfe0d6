// End to end in headless Chromium: the review loop a lead would put their name on.
// A designer changes the battery disconnect's feedback resistor (with a change note), saves a
// run and asks the reviewer for a review; the reviewer gets the mail, finds the run in the queue,
// sees what changed since the previous version and compares the two runs, approves deliberately
// (nothing pre-selected, a note required for changes, a confirmation naming scenario, version and
// run); a later edit shows the approval as out of date on the run and the board. The design
// review report is printed to PDF (A4 and Letter) and its bytes are checked for pages and plot
// images. Also the shared-run page for a visitor and for a signed-in member.
// Screenshots go to test-output/screenshots/, the PDFs to test-output/.
import fs from "node:fs";
import path from "node:path";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { launchBrowser, screenshot, signInPage } from "@/tests/helpers/browser";
import { signIn, startServer, type SignedIn, type TestServer } from "@/tests/helpers/server";
import { DEMO_PASSWORD } from "@/lib/demo/accounts";
import { EMAILS, createRun, firstScenarioId, waitForMail } from "@/tests/helpers/team";

let server: TestServer;
let browser: Browser;
const OUT = path.resolve(__dirname, "../../test-output");

beforeAll(async () => {
  server = await startServer();
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
  await server?.stop();
});

interface ScenarioJson {
  version: number;
  scenario: { stage: Record<string, unknown> } & Record<string, unknown>;
}

async function scenarioOf(s: SignedIn, id: string): Promise<ScenarioJson> {
  const res = await s.fetch(`/api/scenarios/${id}`);
  expect(res.status).toBe(200);
  return (await res.json()) as ScenarioJson;
}

async function saveScenario(
  s: SignedIn,
  id: string,
  edit: (doc: ScenarioJson["scenario"]) => void,
  note: string,
): Promise<number> {
  const cur = await scenarioOf(s, id);
  const doc = structuredClone(cur.scenario);
  edit(doc);
  const res = await s.fetch(`/api/scenarios/${id}`, {
    method: "PUT",
    body: JSON.stringify({ scenario: doc, note, baseVersion: cur.version }),
  });
  expect(res.status, await res.clone().text()).toBe(200);
  return ((await res.json()) as { version: number }).version;
}

/** Pages of a PDF file as Chromium writes it: page objects and image XObjects, counted in the bytes. */
function pdfFacts(bytes: Buffer): { pages: number; images: number } {
  const text = bytes.toString("latin1");
  return {
    pages: (text.match(/\/Type\s*\/Page(?![s\w])/g) ?? []).length,
    images: (text.match(/\/Subtype\s*\/Image\b/g) ?? []).length,
  };
}

async function newPage(errors: string[]): Promise<Page> {
  const context = await browser.newContext({ viewport: { width: 1360, height: 900 } });
  const page = await context.newPage();
  page.on("pageerror", (e) => errors.push(String(e)));
  return page;
}

describe("review you can sign", () => {
  it("request review → mail → queue → changes since the previous version → compare → deliberate approval → out of date after an edit → report PDF", async () => {
    const errors: string[] = [];
    const designer = await signIn(server.url, EMAILS.designer, DEMO_PASSWORD);
    const scenarioId = await firstScenarioId(designer, "Battery low-voltage disconnect");
    await createRun(designer, scenarioId, "Cut-off check, 680k feedback");
    const reviewedVersion = await saveScenario(
      designer,
      scenarioId,
      (d) => (d.stage.rFeedback = 560e3),
      "Feedback 680k → 560k for a wider deadband",
    );
    const runId = await createRun(designer, scenarioId, "Cut-off check, 560k feedback");

    // 1. The designer asks the reviewer from the run page.
    const dPage = await newPage(errors);
    await signInPage(dPage, server.url, EMAILS.designer);
    await dPage.goto(`${server.url}/runs/${runId}`);
    const requestForm = dPage.getByRole("form", { name: "Request review" });
    await requestForm.waitFor();
    await requestForm.getByLabel(/Maren Lie/).check();
    await dPage
      .getByLabel("Message to the reviewers")
      .fill("Wider deadband after the feedback change; please check reconnect.");
    await requestForm.getByRole("button", { name: "Request review" }).click();
    await dPage.getByText(/Review requested from Maren Lie/).waitFor();
    await dPage.getByRole("list", { name: "Review requests" }).getByText("Maren Lie").waitFor();
    await screenshot(dPage, "review-request-sent");

    // 2. The reviewer's mail, through the local mail sink.
    const mail = await waitForMail(
      server.mailDir,
      (m) => m.to.includes(EMAILS.reviewer) && m.subject === 'Review requested: run "Cut-off check, 560k feedback"',
    );
    expect(mail.text).toContain("Wider deadband after the feedback change");
    const runUrl = /https?:\/\/\S+\/runs\/[0-9a-f-]{36}/.exec(mail.text)?.[0];
    expect(runUrl).toBeDefined();
    expect(runUrl!.endsWith(`/runs/${runId}`)).toBe(true);

    // 3. The queue: waiting on the reviewer.
    const rPage = await newPage(errors);
    await signInPage(rPage, server.url, EMAILS.reviewer);
    await rPage.goto(`${server.url}/review`);
    const waiting = rPage.getByRole("table", { name: "Waiting on me" });
    await waiting.getByRole("link", { name: "Cut-off check, 560k feedback" }).waitFor();
    await screenshot(rPage, "review-queue");
    await waiting.getByRole("link", { name: "Cut-off check, 560k feedback" }).click();
    await rPage.waitForURL((u) => u.pathname === `/runs/${runId}`);

    // 4. What changed since the previous version, in the UI's notation, with the change note.
    const diff = rPage.getByRole("table", {
      name: `Changes from version ${reviewedVersion - 1} to ${reviewedVersion}`,
    });
    await diff.waitFor();
    const row = diff.locator("tr", { hasText: "R feedback" });
    await expect.poll(() => row.textContent()).toContain("680 kΩ");
    expect(await row.textContent()).toContain("560 kΩ");
    expect(await rPage.getByText("Feedback 680k → 560k for a wider deadband").count()).toBeGreaterThan(0);

    // 5. Comparison with the previous run (of the previous version): overlays and readings.
    await rPage.getByRole("link", { name: "Compare" }).click();
    await rPage.waitForURL(/\/compare/);
    await rPage.getByTestId("compare-trace").waitFor();
    await rPage.getByTestId("compare-loop").waitFor();
    const readings = rPage.getByTestId("readings-compare");
    await readings.waitFor();
    // A smaller feedback resistor moves the switching points: at least those rows differ.
    expect(await readings.locator('tr[data-differs="yes"]', { hasText: "switching point" }).count()).toBe(2);
    expect(
      await rPage
        .getByRole("table", { name: "Scenario changes between the runs" })
        .locator("tr", { hasText: "R feedback" })
        .count(),
    ).toBe(1);
    await screenshot(rPage, "review-compare");

    // 6. A deliberate sign-off: nothing chosen, a note required for changes, approval confirmed.
    await rPage.goto(`${server.url}/runs/${runId}`);
    const form = rPage.getByRole("form", { name: "Sign off" });
    await form.waitFor();
    expect(await form.getByLabel("Approve", { exact: true }).isChecked()).toBe(false);
    expect(await form.getByLabel("Request changes", { exact: true }).isChecked()).toBe(false);
    expect(await form.getByRole("button", { name: "Sign off" }).isDisabled()).toBe(true);
    await form.getByLabel("Request changes", { exact: true }).check();
    await form.getByRole("button", { name: "Request changes" }).click();
    await form.getByText("a note is required when requesting changes").waitFor();
    await form.getByLabel("Approve", { exact: true }).check();
    await form.getByLabel("Note", { exact: true }).fill("Deadband 11.4 V / 12.5 V as specified.");
    await form.getByRole("button", { name: "Approve…" }).click();
    const confirm = rPage.getByTestId("approve-confirmation");
    await confirm.waitFor();
    const confirmText = (await confirm.textContent()) ?? "";
    expect(confirmText).toContain("Battery low-voltage disconnect");
    expect(confirmText).toContain(`version ${reviewedVersion}`);
    expect(confirmText).toContain("Cut-off check, 560k feedback");
    // Nothing is stored before the confirmation.
    expect(
      ((await (await designer.fetch(`/api/runs/${runId}/signoffs`)).json()) as { items: unknown[] }).items,
    ).toHaveLength(0);
    await screenshot(rPage, "review-approve-confirm");
    await rPage.getByRole("button", { name: `Approve version ${reviewedVersion}` }).click();
    await expect.poll(() => rPage.getByTestId("review-state").textContent(), { timeout: 10_000 }).toContain("Approved");
    const stored = (await (await designer.fetch(`/api/runs/${runId}/signoffs`)).json()) as {
      items: { decision: string; scenarioVersion: number; reviewer: { name: string } }[];
    };
    expect(stored.items[0]).toMatchObject({
      decision: "approved",
      scenarioVersion: reviewedVersion,
      reviewer: { name: "Maren Lie" },
    });
    await waitForMail(
      server.mailDir,
      (m) => m.to.includes(EMAILS.designer) && m.subject === 'Approved: run "Cut-off check, 560k feedback"',
    );
    expect(await rPage.getByTestId("signoff-out-of-date").count()).toBe(0);

    // 7. A later edit: the approval shows as out of date on the run and on the board.
    await saveScenario(designer, scenarioId, (d) => (d.stage.rReference = 36e3), "Reference resistor 33k → 36k");
    await rPage.reload();
    await rPage.getByTestId("signoff-out-of-date").waitFor();
    expect(await rPage.getByTestId("signoff-out-of-date").textContent()).toContain(`version ${reviewedVersion + 1}`);
    await rPage.getByTestId("changes-since-run").waitFor();
    await screenshot(rPage, "review-run-out-of-date");
    const boards = (await (await designer.fetch("/api/boards")).json()) as { items: { id: string }[] };
    await rPage.goto(`${server.url}/boards/${boards.items[0].id}`);
    const boardRow = rPage.getByTestId("scenario-table").locator("tr", { hasText: "Battery low-voltage disconnect" });
    await boardRow.getByTestId("decision-out-of-date").waitFor();
    expect(await boardRow.textContent()).toContain(`approved v${reviewedVersion}`);
    await screenshot(rPage, "review-board-out-of-date");
    // The queue moved the run from "waiting" to "decided".
    await rPage.goto(`${server.url}/review`);
    await rPage
      .getByRole("table", { name: "Decided" })
      .getByRole("link", { name: "Cut-off check, 560k feedback" })
      .waitFor();
    expect(await rPage.getByRole("table", { name: "Waiting on me" }).count()).toBe(0);

    // 8. The design review report, on screen and printed to A4 and Letter.
    await rPage.goto(`${server.url}/runs/${runId}/report`);
    await rPage.getByTestId("report-trace").waitFor();
    await rPage.getByTestId("report-loop").waitFor();
    const report = rPage.getByTestId("review-report");
    // Sign-offs, requests and comments load on their own; the report says when they are in.
    await rPage.locator('[data-testid=review-report][data-review-loaded="true"]').waitFor();
    const reportText = (await report.textContent()) ?? "";
    expect(reportText).toContain("Battery low-voltage disconnect");
    expect(reportText).toContain("Approved by Maren Lie");
    expect(reportText).toContain(`Out of date: the scenario is now at version ${reviewedVersion + 1}`);
    expect(reportText).toContain(`/runs/${runId}`);
    expect(await rPage.getByRole("table", { name: "Parts list" }).locator("tbody tr").count()).toBeGreaterThanOrEqual(
      2,
    );
    expect(await rPage.getByTestId("safety-caution").count()).toBe(1);
    await screenshot(rPage, "review-report");
    fs.mkdirSync(OUT, { recursive: true });
    for (const format of ["A4", "Letter"] as const) {
      const pdf = await rPage.pdf({ format, printBackground: true });
      fs.writeFileSync(path.join(OUT, `review-report-${format}.pdf`), pdf);
      const facts = pdfFacts(pdf);
      // The report is a few pages, not one squeezed page nor dozens of broken ones.
      expect(facts.pages, format).toBeGreaterThanOrEqual(2);
      expect(facts.pages, format).toBeLessThanOrEqual(6);
      // Trace and Loop are images (plus nothing else raster on the page).
      expect(facts.images, format).toBeGreaterThanOrEqual(2);
    }
    expect(errors).toEqual([]);
  });

  it("the shared-run page names the scenario; a visitor may sign in, a signed-in member goes to the run", async () => {
    const errors: string[] = [];
    const designer = await signIn(server.url, EMAILS.designer, DEMO_PASSWORD);
    const scenarioId = await firstScenarioId(designer, "Battery low-voltage disconnect");
    const runId = await createRun(designer, scenarioId, "Shared for the yard");
    const linkRes = await designer.fetch(`/api/runs/${runId}/links`, {
      method: "POST",
      body: JSON.stringify({ expiresInDays: 7, label: "yard bench tech" }),
    });
    expect(linkRes.status).toBe(201);
    const { token } = (await linkRes.json()) as { token: string };

    const visitor = await newPage(errors);
    await visitor.goto(`${server.url}/share/${token}`);
    await visitor.getByTestId("run-view").waitFor();
    expect(await visitor.getByTestId("shared-scenario-name").textContent()).toContain("Battery low-voltage disconnect");
    expect(await visitor.getByRole("link", { name: "Team member? Sign in to review" }).count()).toBe(1);
    expect(await visitor.getByRole("navigation", { name: "Main" }).count()).toBe(0);
    await screenshot(visitor, "review-shared-visitor");

    const member = await newPage(errors);
    await signInPage(member, server.url, EMAILS.reviewer);
    await member.goto(`${server.url}/share/${token}`);
    await member.getByTestId("run-view").waitFor();
    expect(await member.getByRole("link", { name: "Team member? Sign in to review" }).count()).toBe(0);
    await member.getByRole("link", { name: "Open this run in your team space to review" }).click();
    await member.waitForURL((u) => u.pathname === `/runs/${runId}`);

    // The link list shows the label and the visit.
    const dPage = await newPage(errors);
    await signInPage(dPage, server.url, EMAILS.designer);
    await dPage.goto(`${server.url}/runs/${runId}`);
    const links = dPage.getByRole("list", { name: "Run links" });
    await links.getByText("yard bench tech").waitFor();
    expect(await links.textContent()).toMatch(/last opened .*\(2×\)/);
    await screenshot(dPage, "review-run-links");

    // A viewer reads the run but gets neither the sign-off form nor the request form.
    const vPage = await newPage(errors);
    await signInPage(vPage, server.url, EMAILS.viewer);
    await vPage.goto(`${server.url}/runs/${runId}`);
    await vPage.getByTestId("review-panel").waitFor();
    await vPage
      .getByRole("list", { name: "Review requests" })
      .or(vPage.getByText("Nobody has been asked to review this run yet."))
      .waitFor();
    expect(await vPage.getByRole("form", { name: "Sign off" }).count()).toBe(0);
    expect(await vPage.getByRole("form", { name: "Request review" }).count()).toBe(0);

    // The owner's audit log says which run the link was for, and whom it was labelled for.
    const oPage = await newPage(errors);
    await signInPage(oPage, server.url, EMAILS.owner);
    await oPage.goto(`${server.url}/team`);
    const audit = oPage.getByRole("table", { name: "Audit log" });
    const linkRow = audit.locator("tr", { hasText: "created a run link" }).first();
    await linkRow.waitFor();
    expect(await linkRow.textContent()).toContain('run "Shared for the yard" of Battery low-voltage disconnect');
    expect(await linkRow.textContent()).toContain("for yard bench tech");
    await screenshot(oPage, "review-team-audit");

    // Another team's member: the report and the comparison of this run are "not found", and show nothing of it.
    const xPage = await newPage(errors);
    await signInPage(xPage, server.url, EMAILS.other);
    for (const sub of ["report", "compare"]) {
      await xPage.goto(`${server.url}/runs/${runId}/${sub}`);
      // Either the page's own "Run not found" or the app's 404 page: both say it is not there.
      await xPage
        .getByText(/^(Run not found|Nothing at this address)$/)
        .first()
        .waitFor();
      expect(await xPage.content()).not.toContain("Shared for the yard");
    }
    expect(errors).toEqual([]);
  });

  it("the report of an amplifier run shows gain, not switching points, and prints with its plots", async () => {
    const errors: string[] = [];
    const designer = await signIn(server.url, EMAILS.designer, DEMO_PASSWORD);
    const scenarioId = await firstScenarioId(designer, "Hydrophone preamp");
    const runId = await createRun(designer, scenarioId, "Loud burst clipping check");
    const page = await newPage(errors);
    await signInPage(page, server.url, EMAILS.designer);
    await page.goto(`${server.url}/runs/${runId}/report`);
    await page.getByTestId("report-trace").waitFor();
    await page.getByTestId("report-loop").waitFor();
    const spec = page.getByRole("table", { name: "Spec against result" });
    expect(await spec.locator("tbody tr").first().textContent()).toContain("Gain");
    expect(await spec.textContent()).not.toContain("switching point");
    await screenshot(page, "review-report-amplifier");
    const pdf = await page.pdf({ format: "A4", printBackground: true });
    fs.mkdirSync(OUT, { recursive: true });
    fs.writeFileSync(path.join(OUT, "review-report-amplifier-A4.pdf"), pdf);
    const facts = pdfFacts(pdf);
    expect(facts.pages).toBeGreaterThanOrEqual(1);
    expect(facts.images).toBeGreaterThanOrEqual(2);
    expect(errors).toEqual([]);
  });
});

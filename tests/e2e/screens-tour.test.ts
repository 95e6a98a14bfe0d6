// End to end in real Chromium: every screen of the app (boards, a board, the scenario page, a run,
// its shared link, parts, team, captures and the review queue) at phone width, 1280 px and
// 1680 px, signed in as each role. Each page is saved to test-output/screenshots/tour-*.png for a
// person to look at, and measured: the page never scrolls sideways, the header's content edges
// line up with the page's, no label, value or drop-down choice is cut off, no table scrolls
// sideways inside its card, and the run page's cards leave no empty grid cell beside an orphan
// card.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import { launchBrowser, screenshot, signInPage, SCREENSHOT_DIR } from "../helpers/browser";
import { signIn, startServer, type TestServer } from "../helpers/server";
import { EMAILS, createRun, firstScenarioId } from "../helpers/team";
import { DEMO_PASSWORD } from "@/lib/demo/accounts";
import {
  clipped,
  contentEdges,
  cutSelects,
  gridHoles,
  scrollingTables,
  sidewaysOverflow,
  spanOfChildren,
  spillsOut,
} from "./layout-probes";

let server: TestServer;
let browser: Browser;
let boardId = "";
let scenarioId = "";
let runId = "";
let linkToken = "";

beforeAll(async () => {
  server = await startServer();
  browser = await launchBrowser();
  const designer = await signIn(server.url, EMAILS.designer, DEMO_PASSWORD);
  scenarioId = await firstScenarioId(designer, "Battery low-voltage disconnect");
  boardId = ((await (await designer.fetch(`/api/scenarios/${scenarioId}`)).json()) as { boardId: string }).boardId;
  runId = await createRun(designer, scenarioId, "tour run");
  const link = await designer.fetch(`/api/runs/${runId}/links`, { method: "POST", body: "{}" });
  expect(link.status).toBe(201);
  linkToken = ((await link.json()) as { token: string }).token;
  // Something in every list: a review request (the queue), a comment, a pending invitation.
  const members = (await (await designer.fetch("/api/team/members")).json()) as {
    items: { id: string; role: string }[];
  };
  const reviewer = members.items.find((m) => m.role === "reviewer")!;
  const asked = await designer.fetch(`/api/runs/${runId}/review-requests`, {
    method: "POST",
    body: JSON.stringify({ reviewerIds: [reviewer.id], note: "Check the lower switching point at the cold end." }),
  });
  expect(asked.status).toBe(201);
  const comment = await designer.fetch(`/api/runs/${runId}/comments`, {
    method: "POST",
    body: JSON.stringify({ body: "Deadband looks wide enough for the 4 mV rms noise we measured at the pen." }),
  });
  expect(comment.status).toBe(201);
  const owner = await signIn(server.url, EMAILS.owner, DEMO_PASSWORD);
  const invited = await owner.fetch("/api/team/invitations", {
    method: "POST",
    body: JSON.stringify({ email: "kari.strand@fjordline.example", role: "reviewer" }),
  });
  expect(invited.status).toBe(201);
});

afterAll(async () => {
  await browser?.close();
  await server?.stop();
});

const WIDTHS = [390, 1280, 1680];
const ROLES = ["owner", "designer", "reviewer", "viewer"] as const;

/** The screens of the tour and what shows each is ready. */
function screens(): { name: string; path: string; ready: string }[] {
  return [
    { name: "boards", path: "/boards", ready: "[data-testid=board-list]" },
    { name: "board", path: `/boards/${boardId}`, ready: "main h1" },
    { name: "scenario", path: `/scenarios/${scenarioId}`, ready: "main h1" },
    { name: "run", path: `/runs/${runId}`, ready: "[data-testid=run-view] canvas" },
    { name: "parts", path: "/parts", ready: "main h1" },
    { name: "team", path: "/team", ready: "main h1" },
    { name: "captures", path: "/captures", ready: "main h1" },
    { name: "review", path: "/review", ready: "main h1" },
  ];
}

/** Content edges of the header row and of the page body: they must match (±1 px). */
async function headerMisalignment(page: Page): Promise<string | null> {
  const header = await contentEdges(page, "[data-testid=app-header-row]");
  const body = await spanOfChildren(page, "main");
  if (!header || !body) return `header ${JSON.stringify(header)} or page ${JSON.stringify(body)} not found`;
  if (Math.abs(header.left - body.left) > 1 || Math.abs(header.right - body.right) > 1)
    return `header content ${header.left}–${header.right} px, page content ${body.left}–${body.right} px`;
  return null;
}

/**
 * History → View of version 1: the snapshot opens below the list at the card's full width (as
 * wide as the Studies card above it, which spans the result column) and at its full height, not
 * in a scroll box; nothing in it is cut off.
 */
async function historySnapshot(page: Page, tag: string): Promise<string[]> {
  const out: string[] = [];
  await page.locator("[data-testid=history]").getByRole("button", { name: "View" }).first().click();
  const snap = page.getByTestId("history-snapshot");
  await snap.waitFor({ timeout: 30_000 });
  await page.waitForTimeout(200);
  const [box, column] = await Promise.all([snap.boundingBox(), page.getByTestId("studies-card").boundingBox()]);
  if (!box || !column) return ["history snapshot or studies card not shown"];
  if (box.width < column.width * 0.9)
    out.push(`history snapshot ${Math.round(box.width)} px wide in a ${Math.round(column.width)} px column`);
  const scrolls = await snap.evaluate((el) => {
    const boxes = [el, ...Array.from(el.querySelectorAll<HTMLElement>("*"))];
    return boxes.some((b) => {
      const o = getComputedStyle(b).overflowY;
      return (o === "auto" || o === "scroll") && b.scrollHeight > b.clientHeight + 1;
    });
  });
  if (scrolls) out.push("history snapshot scrolls inside the card");
  out.push(...(await clipped(page, "[data-testid=history-snapshot]")));
  await page.locator("section:has(h2:text-is('History'))").screenshot({
    path: `${SCREENSHOT_DIR}/tour-history-snapshot-${tag}.png`,
  });
  return out;
}

async function settle(page: Page, ready: string) {
  await page.locator(ready).first().waitFor({ timeout: 60_000 });
  await page.waitForLoadState("networkidle").catch(() => undefined);
  // Skeletons gone (LoadGate shows aria-busy placeholders while SWR loads).
  await page
    .waitForFunction(() => !document.querySelector("main [aria-busy=true]"), undefined, { timeout: 30_000 })
    .catch(() => undefined);
  await page.waitForTimeout(300);
}

describe("every screen at three widths and four roles", () => {
  for (const width of WIDTHS) {
    it(`lays out every screen cleanly at ${width} px`, async () => {
      const problems: string[] = [];
      for (const role of ROLES) {
        const ctx = await browser.newContext({ viewport: { width, height: 900 } });
        const page = await ctx.newPage();
        const errors: string[] = [];
        page.on("pageerror", (e) => errors.push(String(e)));
        try {
          await signInPage(page, server.url, EMAILS[role]);
          for (const s of screens()) {
            await page.goto(`${server.url}${s.path}`);
            await settle(page, s.ready);
            const tag = `${role} ${s.name} ${width}`;
            await screenshot(page, `tour-${s.name}-${role}-${width}`);
            const over = await sidewaysOverflow(page);
            if (over > 0) problems.push(`${tag}: page scrolls sideways by ${over} px`);
            const misaligned = await headerMisalignment(page);
            if (misaligned) problems.push(`${tag}: ${misaligned}`);
            problems.push(...(await clipped(page, "body")).map((p) => `${tag}: ${p}`));
            problems.push(...(await cutSelects(page, "main")).map((p) => `${tag}: ${p}`));
            problems.push(...(await scrollingTables(page, "main")).map((p) => `${tag}: ${p}`));
            problems.push(...(await spillsOut(page, "main section")).map((p) => `${tag}: ${p}`));
            if (s.name === "run") problems.push(...(await gridHoles(page, "main")).map((p) => `${tag}: ${p}`));
            if (s.name === "scenario" && (role === "owner" || role === "designer"))
              problems.push(...(await historySnapshot(page, `${role}-${width}`)).map((p) => `${tag}: ${p}`));
          }
        } finally {
          await ctx.close();
        }
        problems.push(...errors.map((e) => `${role} ${width}: page error ${e}`));
      }
      // The shared link, as a visitor without a session.
      const anon = await browser.newContext({ viewport: { width, height: 900 } });
      try {
        const page = await anon.newPage();
        await page.goto(`${server.url}/share/${linkToken}`);
        await settle(page, "[data-testid=run-view] canvas");
        await screenshot(page, `tour-shared-visitor-${width}`);
        const over = await sidewaysOverflow(page);
        if (over > 0) problems.push(`shared ${width}: page scrolls sideways by ${over} px`);
        problems.push(...(await clipped(page, "body")).map((p) => `shared ${width}: ${p}`));
        problems.push(...(await gridHoles(page, "main")).map((p) => `shared ${width}: ${p}`));
        const misaligned = await headerMisalignment(page);
        if (misaligned) problems.push(`shared ${width}: ${misaligned}`);
      } finally {
        await anon.close();
      }
      const unique = Array.from(new Set(problems));
      console.log(
        `[tour] ${width} px: ${unique.length} problem(s)${unique.length ? "\n  " + unique.join("\n  ") : ""}`,
      );
      expect(unique).toEqual([]);
    });
  }

  it("keeps the noise margin chart's line tags out of the plotting area at every width", async () => {
    const ctx = await browser.newContext({ viewport: { width: 1680, height: 1000 } });
    const page = await ctx.newPage();
    const problems: string[] = [];
    try {
      await signInPage(page, server.url, EMAILS.designer);
      await page.goto(`${server.url}/scenarios/${scenarioId}`);
      await page.getByTestId("studies-card").waitFor({ timeout: 60_000 });
      await page.getByTestId("run-noise-study").click();
      await page.getByTestId("noise-margin-result").waitFor({ timeout: 180_000 });
      for (const width of [1680, 1280, 390]) {
        await page.setViewportSize({ width, height: 1000 });
        await page.waitForTimeout(600);
        const chart = page.getByTestId("chatter-plot");
        await chart.scrollIntoViewIfNeeded();
        await chart.screenshot({ path: `${SCREENSHOT_DIR}/tour-chatter-plot-${width}.png` });
        const raw = await chart.locator(".uplot").getAttribute("data-tag-boxes");
        expect(raw, "the chart records where it drew its tags").toBeTruthy();
        const { plot, tags } = JSON.parse(raw!) as { plot: number[]; tags: number[][] };
        // The battery disconnect has a deadband, so at least the "deadband / 6.6" tag is drawn.
        expect(tags.length).toBeGreaterThan(0);
        const [left, top, right] = plot;
        tags.forEach(([x0, y0, x1, y1], i) => {
          if (y1 > top) problems.push(`${width} px: tag ${i} reaches ${Math.round(y1 - top)} px into the plot`);
          if (x0 < left - 1 || x1 > right + 1)
            problems.push(`${width} px: tag ${i} (${x0}–${x1}) leaves ${left}–${right}`);
          if (y0 < 0) problems.push(`${width} px: tag ${i} above the chart`);
          tags.forEach(([a0, b0, a1, b1], j) => {
            if (j > i && a0 < x1 && x0 < a1 && b0 < y1 && y0 < b1)
              problems.push(`${width} px: tags ${i} and ${j} overlap`);
          });
        });
      }
    } finally {
      await ctx.close();
    }
    expect(problems).toEqual([]);
  });
});

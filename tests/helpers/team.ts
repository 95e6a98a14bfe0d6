// Fixtures for the team-side integration and e2e tests: every demo actor signed in, one run
// per team to act on, an anonymous fetch, and a reader for the local mail sink's folder.
import fs from "node:fs";
import path from "node:path";
import { DEMO_PASSWORD } from "@/lib/demo/accounts";
import { signIn, type SignedIn, type TestServer } from "./server";

export type Actor = "owner" | "designer" | "reviewer" | "viewer" | "other" | "anon" | "link";
export const ACTORS: Actor[] = ["owner", "designer", "reviewer", "viewer", "other", "anon", "link"];

export interface Caller {
  fetch(path: string, init?: RequestInit): Promise<Response>;
}

export interface TeamFixture {
  callers: Record<Actor, Caller>;
  sessions: Record<"owner" | "designer" | "reviewer" | "viewer" | "other", SignedIn>;
  /** A Fjordline run made by the designer. */
  runId: string;
  scenarioId: string;
  /** A live link token to `runId`: the "link holder" carries it on every request. */
  linkToken: string;
}

export const EMAILS = {
  owner: "owner@fjordline.example",
  designer: "designer@fjordline.example",
  reviewer: "reviewer@fjordline.example",
  viewer: "viewer@fjordline.example",
  other: "owner@harrowmarine.example",
} as const;

function anonymous(url: string, extraHeaders: Record<string, string> = {}): Caller {
  return {
    fetch(p, init = {}) {
      const headers = new Headers(init.headers);
      for (const [k, v] of Object.entries(extraHeaders)) headers.set(k, v);
      if (typeof init.body === "string" && !headers.has("content-type"))
        headers.set("content-type", "application/json");
      return fetch(new URL(p, url), { ...init, headers, redirect: "manual" });
    },
  };
}

async function json<T>(res: Response, what: string): Promise<T> {
  if (!res.ok) throw new Error(`${what}: ${res.status} ${await res.text()}`);
  return (await res.json()) as T;
}

/** First scenario of the caller's first board (the demo seed gives each team one board). */
export async function firstScenarioId(s: SignedIn, name?: string): Promise<string> {
  const boards = await json<{ items: { id: string }[] }>(await s.fetch("/api/boards"), "boards");
  for (const b of boards.items) {
    const list = await json<{ items: { id: string; name: string }[] }>(
      await s.fetch(`/api/scenarios?boardId=${b.id}`),
      "scenarios",
    );
    const hit = name ? list.items.find((x) => x.name === name) : list.items[0];
    if (hit) return hit.id;
  }
  throw new Error(`no scenario${name ? ` named ${name}` : ""}`);
}

export async function createRun(s: SignedIn, scenarioId: string, label = "team test run"): Promise<string> {
  const run = await json<{ id: string }>(
    await s.fetch("/api/runs", { method: "POST", body: JSON.stringify({ scenarioId, label }) }),
    "create run",
  );
  return run.id;
}

export async function setupTeam(server: TestServer): Promise<TeamFixture> {
  const sessions = {} as TeamFixture["sessions"];
  for (const k of Object.keys(EMAILS) as (keyof typeof EMAILS)[])
    sessions[k] = await signIn(server.url, EMAILS[k], DEMO_PASSWORD);
  const scenarioId = await firstScenarioId(sessions.designer, "Battery low-voltage disconnect");
  const runId = await createRun(sessions.designer, scenarioId);
  const link = await json<{ token: string }>(
    await sessions.designer.fetch(`/api/runs/${runId}/links`, { method: "POST", body: "{}" }),
    "create link",
  );
  const callers: Record<Actor, Caller> = {
    owner: sessions.owner,
    designer: sessions.designer,
    reviewer: sessions.reviewer,
    viewer: sessions.viewer,
    other: sessions.other,
    anon: anonymous(server.url),
    // A link holder has no session; the token must not open anything but /api/links/:token.
    link: anonymous(server.url, { authorization: `Bearer ${link.token}`, "x-run-link": link.token }),
  };
  return { callers, sessions, runId, scenarioId, linkToken: link.token };
}

export interface SinkMail {
  id: string;
  to: string[];
  subject: string;
  text: string;
}

export function readMails(mailDir: string): SinkMail[] {
  if (!fs.existsSync(mailDir)) return [];
  return fs
    .readdirSync(mailDir)
    .filter((n) => n.endsWith(".json"))
    .sort()
    .map((n) => JSON.parse(fs.readFileSync(path.join(mailDir, n), "utf8")) as SinkMail);
}

/** Waits until the sink has stored a mail matching `match` (mail is sent after the response). */
export async function waitForMail(
  mailDir: string,
  match: (m: SinkMail) => boolean,
  timeoutMs = 10_000,
): Promise<SinkMail> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const hit = readMails(mailDir).find(match);
    if (hit) return hit;
    if (Date.now() > deadline)
      throw new Error(
        `no matching mail within ${timeoutMs} ms; have: ${readMails(mailDir)
          .map((m) => `${m.to.join(",")}: ${m.subject}`)
          .join(" | ")}`,
      );
    await new Promise((r) => setTimeout(r, 100));
  }
}

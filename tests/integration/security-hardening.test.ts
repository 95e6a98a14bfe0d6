// Server hardening against the real production server on loopback and a fresh SQLite file:
// mailbox isolation per role and team, study uploads held to the run bounds and re-run task by
// task, cross-site request refusals, sign-in and invitation rate limits that survive a restart,
// sign-out / role-change revocation of a copied cookie, a GET on the credentials callback, a
// chunked body cut off at the limit, malformed page paths, other teams' pages and the headers.
import fs from "node:fs";
import http from "node:http";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO_PASSWORD } from "@/lib/demo/accounts";
import { runNoiseTask } from "@/lib/studies";
import { simulate } from "@/lib/sim";
import type { Scenario } from "@/lib/schemas/scenario";
import { signIn, startServer, type SignedIn, type TestServer } from "@/tests/helpers/server";
import { EMAILS, setupTeam, waitForMail, type TeamFixture } from "@/tests/helpers/team";

let server: TestServer;
let fx: TeamFixture;

// The test client on 127.0.0.1 stands in for a trusted reverse proxy: its x-forwarded-for
// names the client (scripts/peer-address.cjs). Any other peer's own header is ignored.
const AS_PROXY = { RAILWISE_TRUSTED_PROXIES: "127.0.0.1" };

beforeAll(async () => {
  server = await startServer({ env: AS_PROXY });
  fx = await setupTeam(server);
});
afterAll(async () => {
  await server?.stop();
});

const text = async (res: Response) => (await res.text()).replace(/<!-- -->/g, "");

async function boardIdOf(s: SignedIn): Promise<string> {
  const res = await s.fetch("/api/boards");
  expect(res.status).toBe(200);
  return ((await res.json()) as { items: { id: string }[] }).items[0].id;
}

async function invite(from: SignedIn, email: string, role = "designer") {
  const res = await from.fetch("/api/team/invitations", { method: "POST", body: JSON.stringify({ email, role }) });
  expect(res.status).toBe(201);
  const mail = await waitForMail(server.mailDir, (m) => m.to.includes(email) && /invited you/.test(m.subject));
  const token = /\/invite\/([A-Za-z0-9_-]{43})/.exec(mail.text)![1];
  return { token, mail };
}

describe("mailbox isolation (issue item 1)", () => {
  it("an owner sees the own team's outgoing mail, never another team's; a member only mail to them", async () => {
    const fjord = await invite(fx.sessions.owner, "newcomer.one@fjordline.example");
    const harrow = await invite(fx.sessions.other, "newcomer.two@harrowmarine.example");

    const page = async (s: SignedIn) => {
      const res = await s.fetch("/dev/mail");
      expect(res.status).toBe(200);
      return text(res);
    };
    const fjordOwner = await page(fx.sessions.owner);
    const harrowOwner = await page(fx.sessions.other);
    const fjordViewer = await page(fx.sessions.viewer);
    // Own team's invitation: visible to its owner; the other team's: not.
    expect(fjordOwner).toContain(fjord.token);
    expect(fjordOwner).not.toContain(harrow.token);
    expect(harrowOwner).toContain(harrow.token);
    expect(harrowOwner).not.toContain(fjord.token);
    // A member who is not the addressee sees neither invitation.
    expect(fjordViewer).not.toContain(fjord.token);
    expect(fjordViewer).not.toContain(harrow.token);
  });
});

describe("study uploads (items 2 and 7)", () => {
  async function runScenario(): Promise<Scenario> {
    const res = await fx.sessions.designer.fetch(`/api/runs/${fx.runId}`);
    expect(res.status).toBe(200);
    return ((await res.json()) as { scenario: Scenario }).scenario;
  }
  const config = (over: Record<string, unknown> = {}) => ({
    kind: "noise-margin",
    seed: 7,
    rmsFrom: 0.001,
    rmsTo: 0.05,
    levels: 3,
    seedsPerLevel: 10,
    bandwidth: 2000,
    limit: 0.01,
    ...over,
  });

  it("a bandwidth past the run bounds is refused with 400 naming the field, before any simulation", async () => {
    const cfg = config({ bandwidth: 1e11, levels: 2, seedsPerLevel: 1 });
    const tasks = Array.from({ length: 3 }, () => ({
      transitions: 1,
      hysteresis: null,
      upperThreshold: null,
      lowerThreshold: null,
    }));
    const res = await fx.sessions.designer.fetch(`/api/runs/${fx.runId}/study`, {
      method: "PUT",
      body: JSON.stringify({ schema: "railwise.study/1", noiseMargin: { config: cfg, tasks } }),
    });
    const body = (await res.json()) as { error: string; message: string; issues: { path: string[] }[] };
    expect(res.status).toBe(400);
    expect(body.message).toMatch(/noise segments/);
    expect(body.issues[0].path).toEqual(["noiseMargin", "config", "bandwidth"]);
  });

  it("every task is re-run: one fabricated task among 31 is refused naming it; an honest upload stores server numbers", async () => {
    const scenario = await runScenario();
    const cfg = config();
    // The honest outputs, computed here with the same core (lib/sim + lib/studies).
    const honest = Array.from({ length: 31 }, (_, i) => runNoiseTask(scenario, cfg as never, i, simulate));
    const forged = honest.map((t, i) => (i === 17 ? { ...t, transitions: 99 } : t));
    const bad = await fx.sessions.designer.fetch(`/api/runs/${fx.runId}/study`, {
      method: "PUT",
      body: JSON.stringify({ schema: "railwise.study/1", noiseMargin: { config: cfg, tasks: forged } }),
    });
    const badBody = (await bad.json()) as { message: string; issues: { path: string[] }[] };
    expect(bad.status).toBe(400);
    expect(badBody.issues[0].path).toEqual(["noiseMargin", "tasks", "17"]);
    // Nothing was stored by the refused upload.
    const none = await fx.sessions.designer.fetch(`/api/runs/${fx.runId}/study`);
    expect(((await none.json()) as { study: unknown }).study).toBeNull();

    const ok = await fx.sessions.designer.fetch(`/api/runs/${fx.runId}/study`, {
      method: "PUT",
      body: JSON.stringify({ schema: "railwise.study/1", noiseMargin: { config: cfg, tasks: honest } }),
    });
    expect(ok.status).toBe(200);
    const stored = (await ok.json()) as { study: { noiseMargin: { tasks: { transitions: number }[] } } };
    expect(stored.study.noiseMargin.tasks.map((t) => t.transitions)).toEqual(honest.map((t) => t.transitions));
  });
});

describe("cross-site request refusals (item 4)", () => {
  it("text/plain JSON, a foreign Origin and a cross-site Sec-Fetch-Site are refused with 403 and change nothing", async () => {
    const s = fx.sessions.designer;
    const comments = async () =>
      ((await (await s.fetch(`/api/runs/${fx.runId}/comments`)).json()) as { items: unknown[] }).items.length;
    const before = await comments();
    const plain = await s.fetch(`/api/runs/${fx.runId}/comments`, {
      method: "POST",
      headers: { "content-type": "text/plain" },
      body: JSON.stringify({ body: "forged comment" }),
    });
    expect(plain.status).toBe(403);
    expect(((await plain.json()) as { error: string }).error).toBe("unsupported_content_type");
    const foreign = await s.fetch(`/api/runs/${fx.runId}/comments`, {
      method: "POST",
      headers: { origin: "http://127.0.0.1:1" },
      body: JSON.stringify({ body: "forged comment" }),
    });
    expect(foreign.status).toBe(403);
    const site = await s.fetch(`/api/runs/${fx.runId}/comments`, {
      method: "POST",
      headers: { "sec-fetch-site": "cross-site" },
      body: JSON.stringify({ body: "forged comment" }),
    });
    expect(site.status).toBe(403);
    expect(await comments()).toBe(before);

    // DELETE of a scenario from another origin: refused, the scenario is still there.
    const create = await s.fetch("/api/scenarios", {
      method: "POST",
      body: JSON.stringify({
        boardId: await boardIdOf(s),
        scenario: (await (await s.fetch(`/api/runs/${fx.runId}`)).json()).scenario,
        name: "CSRF target",
      }),
    });
    expect(create.status).toBe(201);
    const { id } = (await create.json()) as { id: string };
    const del = await s.fetch(`/api/scenarios/${id}`, { method: "DELETE", headers: { origin: "http://evil.example" } });
    expect(del.status).toBe(403);
    expect(((await del.json()) as { error: string }).error).toBe("cross_origin");
    expect((await s.fetch(`/api/scenarios/${id}`)).status).toBe(200);
    // The same request from our own origin goes through.
    const own = await s.fetch(`/api/scenarios/${id}`, { method: "DELETE", headers: { origin: server.url } });
    expect([200, 204], await own.clone().text()).toContain(own.status);
    expect((await s.fetch(`/api/scenarios/${id}`)).status).toBe(404);
  });
});

async function postCredentials(email: string, password: string, headers: Record<string, string> = {}) {
  const csrf = await fetch(`${server.url}/api/auth/csrf`);
  const cookie = csrf.headers
    .getSetCookie()
    .map((c) => c.split(";")[0])
    .join("; ");
  const { csrfToken } = (await csrf.json()) as { csrfToken: string };
  return fetch(`${server.url}/api/auth/callback/credentials`, {
    method: "POST",
    redirect: "manual",
    headers: { "content-type": "application/x-www-form-urlencoded", cookie, ...headers },
    body: new URLSearchParams({ csrfToken, email, password, callbackUrl: `${server.url}/`, json: "true" }),
  });
}

/** One request over a socket bound to `localAddress` (another loopback address than 127.0.0.1). */
function requestFrom(
  localAddress: string,
  url: string,
  { method = "GET", headers = {}, body }: { method?: string; headers?: Record<string, string>; body?: string },
): Promise<{ status: number; setCookies: string[]; text: string }> {
  return new Promise((resolve, reject) => {
    const req = http.request(url, { method, headers, localAddress }, (res) => {
      let text = "";
      res.setEncoding("utf8");
      res.on("data", (d: string) => (text += d));
      res.on("end", () => resolve({ status: res.statusCode ?? 0, setCookies: res.headers["set-cookie"] ?? [], text }));
    });
    req.on("error", reject);
    req.end(body);
  });
}

/** A credentials sign-in sent from `localAddress`, an untrusted peer. */
async function postCredentialsFrom(
  localAddress: string,
  email: string,
  password: string,
  headers: Record<string, string>,
) {
  const csrf = await requestFrom(localAddress, `${server.url}/api/auth/csrf`, {});
  const cookie = csrf.setCookies.map((c) => c.split(";")[0]).join("; ");
  const { csrfToken } = JSON.parse(csrf.text) as { csrfToken: string };
  return requestFrom(localAddress, `${server.url}/api/auth/callback/credentials`, {
    method: "POST",
    headers: { "content-type": "application/x-www-form-urlencoded", cookie, ...headers },
    body: new URLSearchParams({ csrfToken, email, password, callbackUrl: `${server.url}/`, json: "true" }).toString(),
  });
}

describe("sign-in rate limits (item 5)", () => {
  it("an untrusted client's own x-forwarded-for is ignored: its failures count under its socket address", async () => {
    // Without scripts/peer-address.cjs every attempt would name a fresh address and never lock.
    for (let i = 0; i < 20; i++) {
      const res = await postCredentialsFrom("127.0.0.2", `spoof${i}@nowhere.example`, "wrong", {
        "x-forwarded-for": `10.9.${i}.1`,
        "x-real-ip": `10.8.${i}.1`,
      });
      expect(res.status).not.toBe(429);
    }
    const locked = await postCredentialsFrom("127.0.0.2", EMAILS.designer, DEMO_PASSWORD, {
      "x-forwarded-for": "10.9.99.1",
    });
    expect(locked.status).toBe(429);
    expect(locked.setCookies.some((c) => /session-token=[^;]+/.test(c))).toBe(false);
  });

  it("a 320-character email is counted and locked like any other (its key is stored hashed)", async () => {
    // RFC 5321 § 4.5.3.1: local part ≤ 64 and domain ≤ 255 octets, so 320 with the "@".
    const email = `${"l".repeat(64)}@${"d".repeat(250)}.test`;
    expect(email).toHaveLength(320);
    for (let i = 0; i < 5; i++) {
      const res = await postCredentials(email, "wrong", { "x-forwarded-for": `10.6.0.${i}` });
      expect(res.status).toBeLessThan(500);
      expect(res.status).not.toBe(429);
    }
    const locked = await postCredentials(email, "wrong", { "x-forwarded-for": "10.6.0.99" });
    expect(locked.status).toBe(429);
  });

  it("5 wrong passwords lock the account: 429 with Retry-After, even with the right password", async () => {
    const email = EMAILS.reviewer;
    for (let i = 0; i < 5; i++) {
      const res = await postCredentials(email, `wrong-${i}`, { "x-forwarded-for": `10.1.0.${i}` });
      expect(res.status).not.toBe(429);
      expect(res.headers.getSetCookie().some((c) => /session-token=[^;]+/.test(c))).toBe(false);
    }
    const locked = await postCredentials(email, DEMO_PASSWORD, { "x-forwarded-for": "10.1.0.99" });
    expect(locked.status).toBe(429);
    expect(Number(locked.headers.get("retry-after"))).toBeGreaterThan(0);
    expect(locked.headers.getSetCookie().some((c) => /session-token=[^;]+/.test(c))).toBe(false);
  });

  it("20 failures from one address lock that address for every account", async () => {
    for (let i = 0; i < 20; i++) {
      const res = await postCredentials(`nobody${i}@nowhere.example`, "wrong", { "x-forwarded-for": "10.2.0.1" });
      expect(res.status).not.toBe(429);
    }
    const locked = await postCredentials(EMAILS.viewer, DEMO_PASSWORD, { "x-forwarded-for": "10.2.0.1" });
    expect(locked.status).toBe(429);
    // Another address still signs in.
    const other = await postCredentials(EMAILS.viewer, DEMO_PASSWORD, { "x-forwarded-for": "10.2.0.2" });
    expect(other.headers.getSetCookie().some((c) => /session-token=[^;]+/.test(c))).toBe(true);
  });

  it("invitation acceptance: 20 bad tokens from one address → 429", async () => {
    for (let i = 0; i < 20; i++) {
      const token = `${"A".repeat(40)}${String(i).padStart(3, "0")}`;
      const res = await fetch(`${server.url}/api/invitations/${token}/accept`, {
        method: "POST",
        headers: { "content-type": "application/json", "x-forwarded-for": "10.3.0.1" },
        body: JSON.stringify({ name: "Guess", password: "guess-password-123" }),
      });
      expect(res.status).not.toBe(429);
      expect(res.status).toBeLessThan(500);
    }
    const res = await fetch(`${server.url}/api/invitations/${"B".repeat(43)}/accept`, {
      method: "POST",
      headers: { "content-type": "application/json", "x-forwarded-for": "10.3.0.1" },
      body: JSON.stringify({ name: "Guess", password: "guess-password-123" }),
    });
    expect(res.status).toBe(429);
    expect(res.headers.get("retry-after")).toMatch(/^\d+$/);
  });
});

describe("malformed requests answer 4xx (item 9)", () => {
  it("GET on the credentials callback is 405, not 500", async () => {
    const res = await fetch(`${server.url}/api/auth/callback/credentials`, { redirect: "manual" });
    expect(res.status).toBe(405);
  });

  it("a chunked body past the limit is cut off at the limit with 413", async () => {
    const chunk = new Uint8Array(1024 * 1024).fill(0x20);
    let sent = 0;
    const cap = 200 * 1024 * 1024;
    const body = new ReadableStream<Uint8Array>({
      pull(controller) {
        if (sent >= cap) return controller.close();
        sent += chunk.byteLength;
        controller.enqueue(chunk);
      },
    });
    const res = await fetch(`${server.url}/api/scenarios`, {
      method: "POST",
      headers: { cookie: fx.sessions.owner.cookie, "content-type": "application/json" },
      body,
      duplex: "half",
    } as RequestInit);
    expect(res.status).toBe(413);
    // The server stopped reading near the 32 MB limit instead of taking all 200 MB first.
    expect(sent).toBeLessThan(80 * 1024 * 1024);
  });

  it("page paths with undecodable escapes are 404", async () => {
    for (const p of ["/boards/%ff%fe", "/share/%ff", "/runs/%ff", "/scenarios/%ff%fe"]) {
      const res = await fx.sessions.owner.fetch(p);
      expect(res.status, p).toBe(404);
    }
  });
});

describe("pages for another team's ids (item 11)", () => {
  it("answer 404 like the API; the own team's answer 200", async () => {
    const board = await boardIdOf(fx.sessions.owner);
    const pages = [
      `/boards/${board}`,
      `/scenarios/${fx.scenarioId}`,
      `/scenarios/${fx.scenarioId}/summary`,
      `/runs/${fx.runId}`,
    ];
    for (const p of pages) {
      expect((await fx.sessions.owner.fetch(p)).status, p).toBe(200);
      expect((await fx.sessions.other.fetch(p)).status, p).toBe(404);
    }
    // A malformed id is a 404 too.
    expect((await fx.sessions.owner.fetch("/runs/not-a-run-id")).status).toBe(404);
  });
});

describe("security headers (item 10)", () => {
  it("pages carry CSP with frame-ancestors 'none', nosniff, a Permissions-Policy and same-origin referrers", async () => {
    const res = await fetch(`${server.url}/signin`);
    expect(res.status).toBe(200);
    const csp = res.headers.get("content-security-policy") ?? "";
    expect(csp).toContain("frame-ancestors 'none'");
    expect(csp).toContain("default-src 'self'");
    expect(csp).not.toContain("unsafe-eval");
    expect(res.headers.get("x-content-type-options")).toBe("nosniff");
    expect(res.headers.get("referrer-policy")).toBe("same-origin");
    expect(res.headers.get("permissions-policy")).toContain("camera=()");
  });

  it("the shared-run page sends no referrer; API answers with team data are not cached", async () => {
    const share = await fetch(`${server.url}/share/${fx.linkToken}`);
    expect(share.headers.get("referrer-policy")).toBe("no-referrer");
    const api = await fx.sessions.owner.fetch("/api/boards");
    expect(api.headers.get("cache-control")).toContain("no-store");
  });
});

describe("sessions end for real (item 6)", () => {
  it("after sign-out a copied cookie neither reads nor writes", async () => {
    const s = await signIn(server.url, EMAILS.designer, DEMO_PASSWORD);
    const copy = s.cookie;
    expect((await s.fetch("/api/boards")).status).toBe(200);
    const csrf = (await (await s.fetch("/api/auth/csrf")).json()) as { csrfToken: string };
    const out = await fetch(`${server.url}/api/auth/signout`, {
      method: "POST",
      redirect: "manual",
      headers: { "content-type": "application/x-www-form-urlencoded", cookie: copy },
      body: new URLSearchParams({ csrfToken: csrf.csrfToken, callbackUrl: `${server.url}/`, json: "true" }),
    });
    expect(out.status).toBeLessThan(400);
    const read = await fetch(`${server.url}/api/boards`, { headers: { cookie: copy } });
    expect(read.status).toBe(401);
    const write = await fetch(`${server.url}/api/runs`, {
      method: "POST",
      headers: { cookie: copy, "content-type": "application/json" },
      body: JSON.stringify({ scenarioId: fx.scenarioId }),
    });
    expect(write.status).toBe(401);
    // The page session is gone too: the app sends the copy to sign-in.
    const page = await fetch(`${server.url}/boards`, { headers: { cookie: copy }, redirect: "manual" });
    expect([302, 303, 307, 308]).toContain(page.status);
    // Signing in again works.
    const again = await signIn(server.url, EMAILS.designer, DEMO_PASSWORD);
    expect((await again.fetch("/api/boards")).status).toBe(200);
  });

  it("a role change ends the member's sessions", async () => {
    const viewer = await signIn(server.url, EMAILS.viewer, DEMO_PASSWORD);
    expect((await viewer.fetch("/api/boards")).status).toBe(200);
    const members = (await (await fx.sessions.owner.fetch("/api/team/members")).json()) as {
      items: { id: string; email: string }[];
    };
    const v = members.items.find((m) => m.email === EMAILS.viewer)!;
    const change = await fx.sessions.owner.fetch(`/api/team/members/${v.id}`, {
      method: "PATCH",
      body: JSON.stringify({ role: "reviewer" }),
    });
    expect(change.status).toBe(200);
    expect((await viewer.fetch("/api/boards")).status).toBe(401);
    const back = await fx.sessions.owner.fetch(`/api/team/members/${v.id}`, {
      method: "PATCH",
      body: JSON.stringify({ role: "viewer" }),
    });
    expect(back.status).toBe(200);
    // Changing it back does not revive the old cookie.
    expect((await viewer.fetch("/api/boards")).status).toBe(401);
  });
});

describe("rate limits hold across a restart (item 5)", () => {
  it("a locked account is still locked by a new server process on the same database", async () => {
    const email = EMAILS.owner;
    for (let i = 0; i < 5; i++) await postCredentials(email, `wrong-${i}`, { "x-forwarded-for": `10.4.0.${i}` });
    expect((await postCredentials(email, DEMO_PASSWORD, { "x-forwarded-for": "10.4.0.50" })).status).toBe(429);
    if (server.dialect === "postgres") {
      // PostgreSQL: a second server process on the same database (stop() of the first would
      // drop it); the lock is read from the shared table, not from the first process.
      const first = server;
      server = await startServer({ env: { ...AS_PROXY, DATABASE_URL: first.databaseUrl } });
      try {
        expect((await postCredentials(email, DEMO_PASSWORD, { "x-forwarded-for": "10.4.0.51" })).status).toBe(429);
      } finally {
        await server.stop();
        server = first;
      }
      return;
    }
    // SQLite: keep a copy of the database file (stop() removes the server's temp folder), then
    // start a new server process on the copy.
    const keep = fs.mkdtempSync(path.join(os.tmpdir(), "railwise-sec-restart-"));
    const copy = path.join(keep, "railwise.sqlite");
    for (const suffix of ["", "-wal"])
      if (fs.existsSync(server.dbPath + suffix)) fs.copyFileSync(server.dbPath + suffix, copy + suffix);
    await server.stop();
    server = await startServer({ env: { ...AS_PROXY, DATABASE_URL: `sqlite:${copy}` } });
    expect((await postCredentials(email, DEMO_PASSWORD, { "x-forwarded-for": "10.4.0.51" })).status).toBe(429);
  });
});

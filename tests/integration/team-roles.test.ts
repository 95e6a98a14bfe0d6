// Every team-side route × every actor (owner, designer, reviewer, viewer, run-link holder, no
// session, another team's owner), against the real server and a fresh SQLite file. The
// expected statuses are the roles table (DEVELOPERS.md § Roles) and status codes (400/401/403/404/409/413);
// another team's id is a 404, never a 403.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startServer, type TestServer } from "@/tests/helpers/server";
import { ACTORS, EMAILS, setupTeam, type Actor, type TeamFixture } from "@/tests/helpers/team";

let server: TestServer;
let fx: TeamFixture;

beforeAll(async () => {
  server = await startServer();
  fx = await setupTeam(server);
});
afterAll(async () => {
  await server?.stop();
});

const opamp = {
  openLoopGain: 2e5,
  gainBandwidth: 1e6,
  slewRate: 5e5,
  outputHeadroomHigh: 1.5,
  outputHeadroomLow: 1.5,
  inputOffset: 1e-3,
};
let serial = 0;
const unique = (p: string) => `${p} ${++serial}`;

function csvForm(csv: string, fields: Record<string, string> = { timeColumn: "t", voltsColumn: "v" }): FormData {
  const form = new FormData();
  form.set("file", new Blob([csv], { type: "text/csv" }), "probe.csv");
  for (const [k, v] of Object.entries(fields)) form.set(k, v);
  return form;
}

async function as(actor: Actor) {
  return fx.callers[actor];
}

/** Fresh objects for calls that change or remove something, so each actor acts on its own target. */
async function freshPart(): Promise<string> {
  const res = await fx.sessions.designer.fetch("/api/parts", {
    method: "POST",
    body: JSON.stringify({ name: unique("matrix part"), opamp }),
  });
  expect(res.status).toBe(201);
  return ((await res.json()) as { id: string }).id;
}
async function freshCapture(): Promise<string> {
  const res = await fx.sessions.designer.fetch("/api/captures", { method: "POST", body: csvForm("t,v\n0,0\n1,1\n") });
  expect(res.status).toBe(201);
  return ((await res.json()) as { id: string }).id;
}
async function freshLink(): Promise<string> {
  const res = await fx.sessions.designer.fetch(`/api/runs/${fx.runId}/links`, { method: "POST", body: "{}" });
  expect(res.status).toBe(201);
  return ((await res.json()) as { id: string }).id;
}
async function memberId(email: string): Promise<string> {
  const res = await fx.sessions.owner.fetch("/api/team/members");
  const { items } = (await res.json()) as { items: { id: string; email: string }[] };
  return items.find((m) => m.email === email)!.id;
}

interface Case {
  name: string;
  expect: Record<Actor, number>;
  call: (actor: Actor) => Promise<Response>;
}

// Shorthands for the common role patterns of DEVELOPERS.md § Roles.
const everyMember = (other: number): Record<Actor, number> => ({
  owner: 200,
  designer: 200,
  reviewer: 200,
  viewer: 200,
  other,
  anon: 401,
  link: 401,
});
const editors = (ok: number, other: number): Record<Actor, number> => ({
  owner: ok,
  designer: ok,
  reviewer: 403,
  viewer: 403,
  other,
  anon: 401,
  link: 401,
});
const ownerOnly = (ok: number, other: number): Record<Actor, number> => ({
  owner: ok,
  designer: 403,
  reviewer: 403,
  viewer: 403,
  other,
  anon: 401,
  link: 401,
});

const cases: Case[] = [
  {
    name: "GET /api/team/members",
    expect: everyMember(200),
    call: async (a) => (await as(a)).fetch("/api/team/members"),
  },
  {
    name: "PATCH /api/team/members/:id (viewer → viewer)",
    expect: ownerOnly(200, 404),
    call: async (a) =>
      (await as(a)).fetch(`/api/team/members/${await memberId(EMAILS.viewer)}`, {
        method: "PATCH",
        body: JSON.stringify({ role: "viewer" }),
      }),
  },
  {
    // Non-owners are refused before anything is removed; the owner's own removal is in team-flows.
    name: "DELETE /api/team/members/:id (the viewer; refused roles only)",
    expect: { owner: -1, designer: 403, reviewer: 403, viewer: 403, other: 404, anon: 401, link: 401 },
    call: async (a) => (await as(a)).fetch(`/api/team/members/${await memberId(EMAILS.viewer)}`, { method: "DELETE" }),
  },
  {
    name: "POST /api/team/invitations",
    // Another team's owner invites into their own team: allowed.
    expect: ownerOnly(201, 201),
    call: async (a) =>
      (await as(a)).fetch("/api/team/invitations", {
        method: "POST",
        body: JSON.stringify({ email: `${unique("inv").replace(" ", "-")}@example.com`, role: "viewer" }),
      }),
  },
  {
    name: "GET /api/team/invitations",
    expect: ownerOnly(200, 200),
    call: async (a) => (await as(a)).fetch("/api/team/invitations"),
  },
  {
    name: "GET /api/team/audit",
    expect: ownerOnly(200, 200),
    call: async (a) => (await as(a)).fetch("/api/team/audit"),
  },
  {
    name: "POST /api/runs/:id/links",
    expect: editors(201, 404),
    call: async (a) =>
      (await as(a)).fetch(`/api/runs/${fx.runId}/links`, {
        method: "POST",
        body: JSON.stringify({ expiresInDays: 7 }),
      }),
  },
  {
    name: "GET /api/runs/:id/links",
    expect: editors(200, 404),
    call: async (a) => (await as(a)).fetch(`/api/runs/${fx.runId}/links`),
  },
  {
    name: "DELETE /api/runs/:id/links/:linkId",
    expect: editors(200, 404),
    call: async (a) => (await as(a)).fetch(`/api/runs/${fx.runId}/links/${await freshLink()}`, { method: "DELETE" }),
  },
  {
    name: "GET /api/links/:token (no session needed)",
    expect: { owner: 200, designer: 200, reviewer: 200, viewer: 200, other: 200, anon: 200, link: 200 },
    call: async (a) => (await as(a)).fetch(`/api/links/${fx.linkToken}`),
  },
  {
    name: "GET /api/runs/:id/comments",
    expect: everyMember(404),
    call: async (a) => (await as(a)).fetch(`/api/runs/${fx.runId}/comments`),
  },
  {
    name: "POST /api/runs/:id/comments",
    expect: { owner: 201, designer: 201, reviewer: 201, viewer: 403, other: 404, anon: 401, link: 401 },
    call: async (a) =>
      (await as(a)).fetch(`/api/runs/${fx.runId}/comments`, {
        method: "POST",
        body: JSON.stringify({ body: `matrix comment by ${a}` }),
      }),
  },
  {
    name: "GET /api/runs/:id/signoffs",
    expect: everyMember(404),
    call: async (a) => (await as(a)).fetch(`/api/runs/${fx.runId}/signoffs`),
  },
  {
    name: "POST /api/runs/:id/signoffs",
    expect: { owner: 201, designer: 403, reviewer: 201, viewer: 403, other: 404, anon: 401, link: 401 },
    call: async (a) =>
      (await as(a)).fetch(`/api/runs/${fx.runId}/signoffs`, {
        method: "POST",
        body: JSON.stringify({ decision: "changes_requested", note: `matrix ${a}` }),
      }),
  },
  { name: "GET /api/parts", expect: everyMember(200), call: async (a) => (await as(a)).fetch("/api/parts") },
  {
    name: "POST /api/parts",
    expect: editors(201, 201),
    call: async (a) =>
      (await as(a)).fetch("/api/parts", {
        method: "POST",
        body: JSON.stringify({ name: unique("posted part"), opamp }),
      }),
  },
  {
    name: "GET /api/parts/:id",
    expect: everyMember(404),
    call: async (a) => (await as(a)).fetch(`/api/parts/${await freshPart()}`),
  },
  {
    name: "PUT /api/parts/:id",
    expect: editors(200, 404),
    call: async (a) =>
      (await as(a)).fetch(`/api/parts/${await freshPart()}`, {
        method: "PUT",
        body: JSON.stringify({ name: unique("renamed part"), opamp }),
      }),
  },
  {
    name: "DELETE /api/parts/:id",
    expect: editors(204, 404),
    call: async (a) => (await as(a)).fetch(`/api/parts/${await freshPart()}`, { method: "DELETE" }),
  },
  {
    name: "POST /api/parts/import",
    expect: editors(201, 201),
    call: async (a) => {
      const csv = `name,openLoopGain,gainBandwidth,slewRate,outputHeadroomHigh,outputHeadroomLow,inputOffset\n${unique("imported")},1e5,1M,1e6,0.1,0.1,1m\n`;
      return (await as(a)).fetch("/api/parts/import", {
        method: "POST",
        headers: { "content-type": "text/csv" },
        body: csv,
      });
    },
  },
  { name: "GET /api/captures", expect: everyMember(200), call: async (a) => (await as(a)).fetch("/api/captures") },
  {
    name: "POST /api/captures",
    expect: editors(201, 201),
    call: async (a) =>
      (await as(a)).fetch("/api/captures", { method: "POST", body: csvForm("t,v\n0,0.1\n0.001,0.2\n") }),
  },
  {
    name: "GET /api/captures/:id",
    expect: everyMember(404),
    call: async (a) => (await as(a)).fetch(`/api/captures/${await freshCapture()}`),
  },
  {
    name: "DELETE /api/captures/:id",
    expect: editors(204, 404),
    call: async (a) => (await as(a)).fetch(`/api/captures/${await freshCapture()}`, { method: "DELETE" }),
  },
];

describe("team routes × roles", () => {
  for (const c of cases) {
    it(c.name, async () => {
      const got: Partial<Record<Actor, number>> = {};
      const want: Partial<Record<Actor, number>> = {};
      for (const actor of ACTORS) {
        if (c.expect[actor] < 0) continue;
        const res = await c.call(actor);
        got[actor] = res.status;
        want[actor] = c.expect[actor];
        if (res.status >= 400) {
          // Every refusal says why, in JSON.
          const body = (await res.json()) as { error?: string; message?: string };
          expect(typeof body.message, `${c.name} as ${actor}`).toBe("string");
          expect(body.message!.length).toBeGreaterThan(5);
        } else {
          await res.arrayBuffer();
        }
      }
      expect(got).toEqual(want);
    });
  }

  it("lists only the caller's own team", async () => {
    const mine = (await (await fx.sessions.owner.fetch("/api/team/members")).json()) as { items: { email: string }[] };
    const theirs = (await (await fx.sessions.other.fetch("/api/team/members")).json()) as {
      items: { email: string }[];
    };
    expect(mine.items.map((m) => m.email).sort()).toEqual(
      [EMAILS.designer, EMAILS.owner, EMAILS.reviewer, EMAILS.viewer].sort(),
    );
    expect(theirs.items.map((m) => m.email)).toEqual([EMAILS.other]);
    const theirAudit = (await (await fx.sessions.other.fetch("/api/team/audit")).json()) as {
      items: { targetId: string | null }[];
    };
    expect(theirAudit.items.some((e) => e.targetId === fx.runId)).toBe(false);
    // Harrow Marine's part library does not hold Fjordline's parts, and vice versa.
    const fjordParts = (await (await fx.sessions.owner.fetch("/api/parts")).json()) as { items: { id: string }[] };
    const harrowParts = (await (await fx.sessions.other.fetch("/api/parts")).json()) as { items: { id: string }[] };
    const ids = new Set(fjordParts.items.map((p) => p.id));
    expect(harrowParts.items.some((p) => ids.has(p.id))).toBe(false);
  });

  it("answers 400 naming the field for bad bodies, never 5xx", async () => {
    const d = fx.sessions.designer;
    const o = fx.sessions.owner;
    const checks: [Promise<Response>, string][] = [
      [
        o.fetch("/api/team/invitations", {
          method: "POST",
          body: JSON.stringify({ email: "not-an-address", role: "viewer" }),
        }),
        "email",
      ],
      [
        o.fetch("/api/team/invitations", {
          method: "POST",
          body: JSON.stringify({ email: "a@b.example", role: "admin" }),
        }),
        "role",
      ],
      [
        o.fetch(`/api/team/members/${await memberId(EMAILS.viewer)}`, {
          method: "PATCH",
          body: JSON.stringify({ role: "boss" }),
        }),
        "role",
      ],
      [d.fetch(`/api/runs/${fx.runId}/comments`, { method: "POST", body: JSON.stringify({ body: "   " }) }), "body"],
      [
        d.fetch(`/api/runs/${fx.runId}/comments`, { method: "POST", body: JSON.stringify({ body: "x".repeat(2001) }) }),
        "body",
      ],
      [
        o.fetch(`/api/runs/${fx.runId}/signoffs`, { method: "POST", body: JSON.stringify({ decision: "maybe" }) }),
        "decision",
      ],
      [
        d.fetch(`/api/runs/${fx.runId}/links`, {
          method: "POST",
          body: JSON.stringify({ expiresAt: "2001-01-01T00:00:00Z" }),
        }),
        "expiresAt",
      ],
      [
        d.fetch("/api/parts", {
          method: "POST",
          body: JSON.stringify({ name: "bad", opamp: { ...opamp, gainBandwidth: -5 } }),
        }),
        "gainBandwidth",
      ],
      [d.fetch("/api/parts", { method: "POST", body: "{not json" }), ""],
    ];
    for (const [pending, field] of checks) {
      const res = await pending;
      const body = (await res.json()) as { message: string; issues?: { path: (string | number)[] }[] };
      expect(res.status, body.message).toBe(400);
      if (field) expect(JSON.stringify(body.issues ?? body.message)).toContain(field);
    }
  });

  it("refuses a duplicate part name with 409", async () => {
    const name = unique("dup part");
    expect(
      (await fx.sessions.designer.fetch("/api/parts", { method: "POST", body: JSON.stringify({ name, opamp }) }))
        .status,
    ).toBe(201);
    const again = await fx.sessions.owner.fetch("/api/parts", {
      method: "POST",
      body: JSON.stringify({ name: name.toUpperCase(), opamp }),
    });
    expect(again.status).toBe(409);
    expect(((await again.json()) as { message: string }).message).toMatch(/already exists/);
  });
});

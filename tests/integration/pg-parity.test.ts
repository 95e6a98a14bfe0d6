// What used to differ between SQLite and PostgreSQL, checked against the real server on
// whichever database the helper gives it (SQLite by default; PostgreSQL when RAILWISE_TEST_PG
// names a server, which `npm test` and CI do as a second pass): the last-owner rule under
// concurrent demotions, 404 (never 5xx) for malformed ids on every dynamic API route, text up
// to the API's limits, U+0000 stripped at the edge, and list order that does not follow the
// cluster's locale. The expected values come from lib/schemas/README.md's contract and the schemas' limits
// (lib/schemas); the code-point order is JavaScript's default string sort (ECMA-262
// Array.prototype.sort compares UTF-16 code units, which equals UTF-8 byte order for the BMP
// text used here).
import { hash } from "bcryptjs";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO_PASSWORD } from "@/lib/demo/accounts";
import { withServerDb } from "@/tests/helpers/db";
import { signIn, startServer, type SignedIn, type TestServer } from "@/tests/helpers/server";
import { EMAILS, firstScenarioId, setupTeam, type TeamFixture } from "@/tests/helpers/team";

let server: TestServer;
let fx: TeamFixture;

beforeAll(async () => {
  server = await startServer();
  fx = await setupTeam(server);
});
afterAll(async () => {
  await server?.stop();
});

const body = (value: unknown) => ({ body: JSON.stringify(value) });

describe(`database: ${process.env.RAILWISE_TEST_PG ? "PostgreSQL" : "SQLite"}`, () => {
  it("the server runs on the database the helper chose", () => {
    expect(server.dialect).toBe(process.env.RAILWISE_TEST_PG ? "postgres" : "sqlite");
    expect(server.databaseUrl.startsWith(server.dialect === "postgres" ? "postgres" : "sqlite:")).toBe(true);
  });
});

describe("last-owner rule under concurrency", () => {
  it("two owners demoted at the same moment leave exactly one owner, 12 times out of 12", async () => {
    // A second owner for Harrow Marine, written through the app's models (test set-up only).
    const secondEmail = "second.owner@harrowmarine.example";
    const ids = await withServerDb(server, async ({ models }) => {
      const first = await models.User.findOne({ where: { email: EMAILS.other } });
      const membership = await models.Membership.findOne({ where: { userId: first!.id } });
      const second = await models.User.create({
        email: secondEmail,
        name: "Second Owner",
        passwordHash: await hash(DEMO_PASSWORD, 10),
      });
      await models.Membership.create({ userId: second.id, teamId: membership!.teamId as string, role: "owner" });
      return { teamId: membership!.teamId as string, first: first!.id, second: second.id };
    });
    const owners = () =>
      withServerDb(server, ({ models }) => models.Membership.count({ where: { teamId: ids.teamId, role: "owner" } }));

    for (let attempt = 0; attempt < 12; attempt++) {
      await withServerDb(server, ({ models }) =>
        models.Membership.update({ role: "owner" }, { where: { teamId: ids.teamId } }),
      );
      expect(await owners()).toBe(2);
      // Each owner demotes the other at once (fresh sessions: a role change ends the old ones).
      const [a, b] = await Promise.all([
        signIn(server.url, EMAILS.other, DEMO_PASSWORD),
        signIn(server.url, secondEmail, DEMO_PASSWORD),
      ]);
      const results = await Promise.all([
        a.fetch(`/api/team/members/${ids.second}`, { method: "PATCH", ...body({ role: "designer" }) }),
        b.fetch(`/api/team/members/${ids.first}`, { method: "PATCH", ...body({ role: "viewer" }) }),
      ]);
      const statuses = results.map((r) => r.status);
      // One succeeds; the other is refused (409: only owner) or, if its sender was demoted
      // first, no longer an owner (401/403). Never both 200, never a 5xx.
      expect(
        statuses.filter((s) => s === 200),
        `attempt ${attempt}: ${statuses}`,
      ).toHaveLength(1);
      expect(statuses.every((s) => s < 500)).toBe(true);
      expect(await owners(), `attempt ${attempt}`).toBe(1);
    }
    await withServerDb(server, ({ models }) =>
      models.Membership.update({ role: "owner" }, { where: { userId: ids.first } }),
    );
  });
});

describe("malformed ids → 404 on every dynamic API route", () => {
  const UUID = "00000000-0000-4000-8000-000000000000";
  const bad = [
    "%00",
    "%ff%fe",
    "not-a-uuid",
    `${UUID}%00`,
    "x".repeat(3000),
    "%27%3B%20drop%20table%20users",
    "..%2F..%2Fetc",
  ];

  // [method, path template with :id / :linkId / :v, body]
  const routes: [string, string, unknown?][] = [
    ["GET", "/api/boards/:id"],
    ["PATCH", "/api/boards/:id", { name: "x" }],
    ["DELETE", "/api/boards/:id"],
    ["GET", "/api/scenarios/:id"],
    ["PUT", "/api/scenarios/:id", { name: "x" }],
    ["DELETE", "/api/scenarios/:id"],
    ["GET", "/api/scenarios/:id/versions"],
    ["GET", "/api/scenarios/:id/versions/1"],
    ["POST", "/api/scenarios/:id/versions/1/restore", {}],
    ["GET", "/api/runs/:id"],
    ["DELETE", "/api/runs/:id"],
    ["GET", "/api/runs/:id/comments"],
    ["POST", "/api/runs/:id/comments", { body: "hello" }],
    ["GET", "/api/runs/:id/signoffs"],
    ["POST", "/api/runs/:id/signoffs", { decision: "approved", note: "ok" }],
    ["GET", "/api/runs/:id/links"],
    ["POST", "/api/runs/:id/links", {}],
    ["DELETE", `/api/runs/:id/links/${UUID}`],
    ["GET", "/api/runs/:id/study"],
    ["PUT", "/api/runs/:id/study", {}],
    ["GET", "/api/parts/:id"],
    ["PUT", "/api/parts/:id", { name: "x", opamp: {} }],
    ["DELETE", "/api/parts/:id"],
    ["GET", "/api/captures/:id"],
    ["DELETE", "/api/captures/:id"],
    ["PATCH", "/api/team/members/:id", { role: "viewer" }],
    ["DELETE", "/api/team/members/:id"],
    ["DELETE", "/api/team/invitations/:id"],
    ["GET", "/api/links/:id"],
    ["GET", "/api/invitations/:id"],
    ["POST", "/api/invitations/:id/accept", { name: "x", password: "long-enough-pass" }],
  ];

  it(`${routes.length} routes × ${bad.length} ids (and the link id of a real run): 404, nothing changed`, async () => {
    const owner = fx.sessions.owner;
    const before = await withServerDb(server, async ({ models }) => ({
      boards: await models.Board.count(),
      members: await models.Membership.count(),
    }));
    const failures: string[] = [];
    const calls: Promise<void>[] = [];
    for (const [method, template, payload] of routes) {
      for (const id of bad) {
        const path = template.replace(":id", id);
        calls.push(
          owner.fetch(path, { method, ...(payload === undefined ? {} : body(payload)) }).then(async (res) => {
            const text = await res.text();
            if (res.status !== 404)
              failures.push(`${method} ${path.slice(0, 80)} → ${res.status} ${text.slice(0, 120)}`);
          }),
        );
      }
    }
    for (const id of bad) {
      const path = `/api/runs/${fx.runId}/links/${id}`;
      calls.push(
        owner.fetch(path, { method: "DELETE" }).then((res) => {
          if (res.status !== 404) failures.push(`DELETE ${path.slice(0, 80)} → ${res.status}`);
        }),
      );
    }
    await Promise.all(calls);
    expect(failures).toEqual([]);
    const after = await withServerDb(server, async ({ models }) => ({
      boards: await models.Board.count(),
      members: await models.Membership.count(),
    }));
    expect(after).toEqual(before);
  });
});

describe("text up to the API's limits, U+0000 stripped, locale-free order", () => {
  let designer: SignedIn;
  beforeAll(() => {
    designer = fx.sessions.designer;
  });

  it("a 500-character note (the schema's limit) is stored whole; 501 is a 400 naming note", async () => {
    const id = await firstScenarioId(designer, "Hydrophone preamp");
    const note = "n".repeat(499) + "é";
    const ok = await designer.fetch(`/api/scenarios/${id}`, {
      method: "PUT",
      ...body({ name: "Hydrophone preamp", note }),
    });
    expect(ok.status).toBe(200);
    const { version } = (await ok.json()) as { version: number };
    const versions = (await (await designer.fetch(`/api/scenarios/${id}/versions`)).json()) as {
      items: { version: number; note: string | null }[];
    };
    expect(versions.items.find((v) => v.version === version)?.note).toBe(note);

    const tooLong = await designer.fetch(`/api/scenarios/${id}`, {
      method: "PUT",
      ...body({ name: "Hydrophone preamp", note: "n".repeat(501) }),
    });
    expect(tooLong.status).toBe(400);
    expect(JSON.stringify(await tooLong.json())).toMatch(/note/);
  });

  it("a 2000-character board description and a 120-character name are stored whole", async () => {
    const name = "B".repeat(120);
    const description = "d".repeat(2000);
    const res = await fx.sessions.owner.fetch("/api/boards", { method: "POST", ...body({ name, description }) });
    expect(res.status).toBe(201);
    const created = (await res.json()) as { id: string };
    const read = (await (await fx.sessions.owner.fetch(`/api/boards/${created.id}`)).json()) as {
      name: string;
      description: string;
    };
    expect(read).toMatchObject({ name, description });
    expect((await fx.sessions.owner.fetch(`/api/boards/${created.id}`, { method: "DELETE" })).status).toBe(200);
  });

  it("U+0000 in JSON text is removed before it is stored (same on both databases)", async () => {
    const id = await firstScenarioId(designer, "Hydrophone preamp");
    const res = await designer.fetch(`/api/scenarios/${id}`, {
      method: "PUT",
      ...body({ name: "Hydro\u0000phone preamp", note: "nul\u0000here" }),
    });
    expect(res.status).toBe(200);
    const saved = (await res.json()) as { name: string; version: number; scenario: { name: string } };
    expect(saved.name).toBe("Hydrophone preamp");
    expect(saved.scenario.name).toBe("Hydrophone preamp");
    const stored = await withServerDb(server, ({ models }) =>
      models.ScenarioVersion.findOne({ where: { scenarioId: id, version: saved.version } }),
    );
    expect(stored?.note).toBe("nulhere");
    expect(stored?.name).toBe("Hydrophone preamp");
  });

  it("boards list in code-point order (capitals before small letters, accents last), whatever the locale", async () => {
    const names = ["zeta board", "Zeta board", "alpha board", "Älpha board", "_under board", "Alpha board"];
    const created: string[] = [];
    for (const name of names) {
      const res = await fx.sessions.owner.fetch("/api/boards", { method: "POST", ...body({ name }) });
      expect(res.status).toBe(201);
      created.push(((await res.json()) as { id: string }).id);
    }
    const list = (await (await fx.sessions.owner.fetch("/api/boards")).json()) as {
      items: { id: string; name: string }[];
    };
    const ours = list.items.filter((b) => created.includes(b.id)).map((b) => b.name);
    // ECMA-262 default sort: UTF-16 code-unit order ("A" 0x41 < "Z" 0x5A < "_" 0x5F < "a" 0x61 < "Ä" 0xC4).
    expect(ours).toEqual([...names].sort());
    expect(ours).toEqual(["Alpha board", "Zeta board", "_under board", "alpha board", "zeta board", "Älpha board"]);
    for (const id of created)
      expect((await fx.sessions.owner.fetch(`/api/boards/${id}`, { method: "DELETE" })).status).toBe(200);
  });
});

describe("lean lists", () => {
  it("the scenario list leaves out waveform arrays; the scenario itself has them", async () => {
    const boards = (await (await designer().fetch("/api/boards")).json()) as { items: { id: string }[] };
    const boardId = boards.items[0].id;
    const points = Array.from({ length: 5000 }, (_, i) => [i * 1e-3, Math.sin(i / 50)]);
    const base = (await (await designer().fetch(`/api/scenarios/${fx.scenarioId}`)).json()) as {
      scenario: Record<string, unknown> & { input: { components: unknown[] } };
    };
    const scenario = { ...base.scenario, input: { ...base.scenario.input, components: [{ kind: "pwl", points }] } };
    const res = await designer().fetch("/api/scenarios", {
      method: "POST",
      ...body({ boardId, name: "Long pwl", scenario }),
    });
    expect(res.status).toBe(201);
    const { id } = (await res.json()) as { id: string };

    const listRes = await designer().fetch(`/api/scenarios?boardId=${boardId}`);
    const listText = await listRes.text();
    const item = (
      JSON.parse(listText) as {
        items: {
          id: string;
          lean?: boolean;
          scenario: { input: { components: { kind: string; points?: unknown[]; pointCount?: number }[] } };
        }[];
      }
    ).items.find((s) => s.id === id)!;
    expect(item.lean).toBe(true);
    expect(item.scenario.input.components[0]).toMatchObject({ kind: "pwl", points: [], pointCount: 5000 });
    // 5000 points would be > 100 kB of JSON; the whole list stays far below that.
    expect(listText.length).toBeLessThan(60_000);

    const full = (await (await designer().fetch(`/api/scenarios/${id}`)).json()) as {
      scenario: { input: { components: { points: unknown[] }[] } };
    };
    expect(full.scenario.input.components[0].points).toHaveLength(5000);

    // A rename keeps the stored points (the board page sends the name only).
    const renamed = await designer().fetch(`/api/scenarios/${id}`, {
      method: "PUT",
      ...body({ name: "Long pwl renamed" }),
    });
    expect(renamed.status).toBe(200);
    const after = (await (await designer().fetch(`/api/scenarios/${id}`)).json()) as {
      name: string;
      scenario: { input: { components: { points: unknown[] }[] } };
    };
    expect(after.name).toBe("Long pwl renamed");
    expect(after.scenario.input.components[0].points).toHaveLength(5000);
    expect((await designer().fetch(`/api/scenarios/${id}`, { method: "DELETE" })).status).toBe(200);
  });
});

function designer() {
  return fx.sessions.designer;
}

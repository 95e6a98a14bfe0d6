// Team flows end to end against the real server, its SMTP sink and a fresh database (SQLite, or PostgreSQL with RAILWISE_TEST_PG):
// invitations by mail, the last-owner rule, run links (open without a session, revoke,
// expire), review mails, the audit log, upload limits and malformed CSVs (never a 5xx,
// nothing stored), and 50 concurrent writes that lose nothing.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO_PASSWORD } from "@/lib/demo/accounts";
import { withServerDb } from "@/tests/helpers/db";
import { signIn, startServer, type TestServer } from "@/tests/helpers/server";
import { EMAILS, firstScenarioId, readMails, setupTeam, waitForMail, type TeamFixture } from "@/tests/helpers/team";

let server: TestServer;
let fx: TeamFixture;

beforeAll(async () => {
  server = await startServer();
  fx = await setupTeam(server);
});
afterAll(async () => {
  await server?.stop();
});

async function count(path: string, as = fx.sessions.owner): Promise<number> {
  const res = await as.fetch(path);
  expect(res.status).toBe(200);
  return ((await res.json()) as { items: unknown[] }).items.length;
}

async function invite(email: string, role: string) {
  const res = await fx.sessions.owner.fetch("/api/team/invitations", {
    method: "POST",
    body: JSON.stringify({ email, role }),
  });
  expect(res.status).toBe(201);
  const body = (await res.json()) as { id: string; mailSent: boolean };
  expect(body.mailSent).toBe(true);
  const mail = await waitForMail(server.mailDir, (m) => m.to.includes(email) && /invited you/.test(m.subject));
  const link = /https?:\/\/\S+\/invite\/([A-Za-z0-9_-]+)/.exec(mail.text);
  expect(link, mail.text).not.toBeNull();
  return { id: body.id, url: link![0], token: link![1], mail };
}

describe("invitations through the SMTP sink", () => {
  it("mail received → link followed → password set → signed in with the invited role", async () => {
    const { url, token, mail } = await invite("ada.new@fjordline.example", "reviewer");
    expect(mail.subject).toContain("Fjordline Aquaculture");
    expect(url.startsWith(server.url)).toBe(true);
    // ≥ 128 bits: 32 random bytes in base64url.
    expect(token).toMatch(/^[A-Za-z0-9_-]{43}$/);

    const page = await fetch(url);
    expect(page.status).toBe(200);
    // React separates adjacent text with <!-- --> markers; read the text as a browser would.
    const html = (await page.text()).replace(/<!-- -->/g, "");
    expect(html).toContain("Join Fjordline Aquaculture");
    expect(html).toContain("ada.new@fjordline.example");

    const short = await fetch(`${server.url}/api/invitations/${token}/accept`, {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: JSON.stringify({ name: "Ada New", password: "short" }),
    });
    expect(short.status).toBe(400);
    expect(JSON.stringify(await short.json())).toContain("password");

    const accept = await fetch(`${server.url}/api/invitations/${token}/accept`, {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: JSON.stringify({ name: "Ada New", password: "tidewater-1234" }),
    });
    expect(accept.status).toBe(201);

    const ada = await signIn(server.url, "ada.new@fjordline.example", "tidewater-1234");
    expect(ada.session.user.role).toBe("reviewer");
    expect(ada.session.user.teamName).toBe("Fjordline Aquaculture");
    // The new reviewer can do what reviewers do, and no more.
    expect(
      (
        await ada.fetch(`/api/runs/${fx.runId}/comments`, {
          method: "POST",
          body: JSON.stringify({ body: "Joined, reading the run." }),
        })
      ).status,
    ).toBe(201);
    expect((await ada.fetch("/api/parts", { method: "POST", body: JSON.stringify({ name: "nope" }) })).status).toBe(
      403,
    );

    // Single use: a second accept is refused; so is a made-up token.
    const again = await fetch(`${server.url}/api/invitations/${token}/accept`, {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: JSON.stringify({ name: "Mallory", password: "another-password" }),
    });
    expect(again.status).toBe(410);
    const bogus = await fetch(`${server.url}/api/invitations/${"A".repeat(43)}/accept`, {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: JSON.stringify({ name: "Mallory", password: "another-password" }),
    });
    expect(bogus.status).toBe(404);

    const members = (await (await fx.sessions.owner.fetch("/api/team/members")).json()) as {
      items: { email: string; role: string; name: string }[];
    };
    expect(members.items.find((m) => m.email === "ada.new@fjordline.example")).toMatchObject({
      role: "reviewer",
      name: "Ada New",
    });
  });

  it("an expired invitation answers 410 and creates no account", async () => {
    const { id, token } = await invite("late.comer@fjordline.example", "viewer");
    // Moved into the past through the app's own models (works on SQLite and PostgreSQL).
    const [changed] = await withServerDb(server, ({ models }) =>
      models.Invitation.update({ expiresAt: new Date("2000-01-01T00:00:00Z") }, { where: { id } }),
    );
    expect(changed).toBe(1);
    const res = await fetch(`${server.url}/api/invitations/${token}/accept`, {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: JSON.stringify({ name: "Late", password: "too-late-for-this" }),
    });
    expect(res.status).toBe(410);
    expect(((await res.json()) as { message: string }).message).toMatch(/expired/);
    await expect(signIn(server.url, "late.comer@fjordline.example", "too-late-for-this")).rejects.toThrow(/refused/);
  });

  it("inviting an existing member is a 409", async () => {
    const res = await fx.sessions.owner.fetch("/api/team/invitations", {
      method: "POST",
      body: JSON.stringify({ email: EMAILS.viewer, role: "designer" }),
    });
    expect(res.status).toBe(409);
  });
});

describe("membership", () => {
  it("never leaves the team without an owner (409), and a removed member loses access at once", async () => {
    const owner = fx.sessions.owner;
    const me = owner.session.user.id;
    const demote = await owner.fetch(`/api/team/members/${me}`, {
      method: "PATCH",
      body: JSON.stringify({ role: "designer" }),
    });
    expect(demote.status).toBe(409);
    expect(((await demote.json()) as { message: string }).message).toMatch(/only owner/);
    expect((await owner.fetch(`/api/team/members/${me}`, { method: "DELETE" })).status).toBe(409);

    // Bring in a member by invitation, promote, demote, remove.
    const { token } = await invite("temp.member@fjordline.example", "designer");
    expect(
      (
        await fetch(`${server.url}/api/invitations/${token}/accept`, {
          method: "POST",
          headers: { "content-type": "application/json" },
          body: JSON.stringify({ name: "Temp Member", password: "temporary-pass" }),
        })
      ).status,
    ).toBe(201);
    const temp = await signIn(server.url, "temp.member@fjordline.example", "temporary-pass");
    const tempId = temp.session.user.id;
    expect(
      (await owner.fetch(`/api/team/members/${tempId}`, { method: "PATCH", body: JSON.stringify({ role: "owner" }) }))
        .status,
    ).toBe(200);
    // A role change ends the member's sessions (issue 15 item 6): sign in again with the new role.
    expect((await temp.fetch("/api/team/members")).status).toBe(401);
    Object.assign(temp, await signIn(server.url, "temp.member@fjordline.example", "temporary-pass"));
    // Two owners now: the first may step down, and step back up (via the second).
    expect(
      (await owner.fetch(`/api/team/members/${me}`, { method: "PATCH", body: JSON.stringify({ role: "designer" }) }))
        .status,
    ).toBe(200);
    expect(
      (await temp.fetch(`/api/team/members/${me}`, { method: "PATCH", body: JSON.stringify({ role: "owner" }) }))
        .status,
    ).toBe(200);
    // The owner's own cookie ended with the step-down; the shared fixture session signs in again.
    Object.assign(owner, await signIn(server.url, EMAILS.owner, DEMO_PASSWORD));
    const removed = await owner.fetch(`/api/team/members/${tempId}`, { method: "DELETE" });
    expect(removed.status).toBe(204);
    // The removed member's session no longer opens anything.
    expect((await temp.fetch("/api/team/members")).status).toBe(401);

    const audit = (await (await owner.fetch("/api/team/audit")).json()) as {
      items: { action: string; targetId: string | null }[];
    };
    const actions = audit.items.filter((e) => e.targetId === tempId).map((e) => e.action);
    expect(actions).toEqual(expect.arrayContaining(["member.joined", "member.role_changed", "member.removed"]));
  });
});

describe("run links", () => {
  it("create → open without a session → revoke → 410 at once; the page follows", async () => {
    const create = await fx.sessions.designer.fetch(`/api/runs/${fx.runId}/links`, {
      method: "POST",
      body: JSON.stringify({ expiresInDays: 7 }),
    });
    expect(create.status).toBe(201);
    const link = (await create.json()) as { id: string; token: string; url: string; expiresAt: string };
    expect(link.token).toMatch(/^[A-Za-z0-9_-]{43}$/);
    expect(Date.parse(link.expiresAt) - Date.now()).toBeGreaterThan(6.9 * 86_400_000);

    const open = await fetch(`${server.url}/api/links/${link.token}`);
    expect(open.status).toBe(200);
    const shared = (await open.json()) as Record<string, unknown>;
    expect(shared.id).toBe(fx.runId);
    expect((shared.result as { schema: string }).schema).toBe("railwise.result/1");
    expect((shared.scenario as { schema: string }).schema).toBe("railwise.scenario/1");
    // The run only: nothing that leads back into the team.
    for (const key of ["teamId", "scenarioId", "createdBy", "boardId"]) expect(shared).not.toHaveProperty(key);
    const text = JSON.stringify(shared);
    for (const leak of ["fjordline.example", "Tomas Berge", "Fjordline Aquaculture"]) expect(text).not.toContain(leak);

    const page = await fetch(`${server.url}/share/${link.token}`);
    expect(page.status).toBe(200);
    expect(await page.text()).toContain("Read-only run link");

    const revoke = await fx.sessions.owner.fetch(`/api/runs/${fx.runId}/links/${link.id}`, { method: "DELETE" });
    expect(revoke.status).toBe(200);
    expect(((await revoke.json()) as { state: string }).state).toBe("revoked");
    expect((await fetch(`${server.url}/api/links/${link.token}`)).status).toBe(410);
    expect((await fetch(`${server.url}/share/${link.token}`)).status).toBe(404);
    expect((await fetch(`${server.url}/api/links/${"x".repeat(43)}`)).status).toBe(404);

    const audit = (await (await fx.sessions.owner.fetch("/api/team/audit")).json()) as {
      items: { action: string; details: { linkId?: string } }[];
    };
    const linkActions = audit.items.filter((e) => e.details?.linkId === link.id).map((e) => e.action);
    expect(linkActions.sort()).toEqual(["link.created", "link.revoked"]);
  });

  it("an expired link stops working without anyone revoking it", async () => {
    const expiresAt = new Date(Date.now() + 1500).toISOString();
    const res = await fx.sessions.designer.fetch(`/api/runs/${fx.runId}/links`, {
      method: "POST",
      body: JSON.stringify({ expiresAt }),
    });
    expect(res.status).toBe(201);
    const { token } = (await res.json()) as { token: string };
    expect((await fetch(`${server.url}/api/links/${token}`)).status).toBe(200);
    await new Promise((r) => setTimeout(r, 1800));
    const late = await fetch(`${server.url}/api/links/${token}`);
    expect(late.status).toBe(410);
    expect(((await late.json()) as { message: string }).message).toMatch(/expired/);
  });
});

describe("review", () => {
  it("sign-off mails the run's author, shows as the scenario's latest decision, and is audited", async () => {
    const before = readMails(server.mailDir).length;
    const res = await fx.sessions.reviewer.fetch(`/api/runs/${fx.runId}/signoffs`, {
      method: "POST",
      body: JSON.stringify({ decision: "approved", note: "Thresholds 11.4 V / 12.5 V within 1 %." }),
    });
    expect(res.status).toBe(201);
    const signoff = (await res.json()) as { id: string; decision: string; reviewer: { name: string } };
    expect(signoff).toMatchObject({ decision: "approved", reviewer: { name: "Maren Lie" } });

    const mail = await waitForMail(
      server.mailDir,
      (m) => m.to.includes(EMAILS.designer) && m.subject.startsWith("Approved"),
    );
    expect(mail.text).toContain("Thresholds 11.4 V / 12.5 V within 1 %.");
    expect(mail.text).toContain(`/runs/${fx.runId}`);
    expect(readMails(server.mailDir).length).toBeGreaterThan(before);

    const latest = (await (await fx.sessions.viewer.fetch(`/api/runs/${fx.runId}/signoffs`)).json()) as {
      items: { id: string }[];
    };
    expect(latest.items[0].id).toBe(signoff.id);

    const scenario = (await (await fx.sessions.viewer.fetch(`/api/scenarios/${fx.scenarioId}`)).json()) as {
      latestDecision: { decision: string; runId: string } | null;
    };
    expect(scenario.latestDecision).toMatchObject({ decision: "approved", runId: fx.runId });

    const audit = (await (await fx.sessions.owner.fetch("/api/team/audit")).json()) as {
      items: { action: string; details: { signoffId?: string } }[];
    };
    expect(audit.items.some((e) => e.action === "signoff.created" && e.details?.signoffId === signoff.id)).toBe(true);
  });

  it("a comment mails the other participants, not its author; text stays plain", async () => {
    const body = "Deadband looks <b>wide</b> enough;\nsee the Loop plot.";
    const res = await fx.sessions.owner.fetch(`/api/runs/${fx.runId}/comments`, {
      method: "POST",
      body: JSON.stringify({ body }),
    });
    expect(res.status).toBe(201);
    expect(((await res.json()) as { body: string }).body).toBe(body);
    const mail = await waitForMail(
      server.mailDir,
      (m) => m.subject.startsWith("New comment") && m.text.includes("<b>wide</b>"),
    );
    expect(mail.to).toContain(EMAILS.designer); // the run's author
    expect(mail.to).toContain(EMAILS.reviewer); // signed off earlier
    expect(mail.to).not.toContain(EMAILS.owner); // the commenter
  });
});

describe("uploads: limits and malformed CSVs (never a 5xx, nothing stored)", () => {
  function form(csv: string | Blob, fields: Record<string, string> = { timeColumn: "t", voltsColumn: "v" }) {
    const f = new FormData();
    f.set("file", typeof csv === "string" ? new Blob([csv], { type: "text/csv" }) : csv, "upload.csv");
    for (const [k, v] of Object.entries(fields)) f.set(k, v);
    return f;
  }

  it("refuses each bad file with a message naming row and column, and stores nothing", async () => {
    const before = await count("/api/captures");
    const bad: [string | Blob, Record<string, string> | undefined, number, RegExp][] = [
      ["", undefined, 400, /empty/],
      ["t,v\n", undefined, 400, /no data rows/],
      ["t,v\n0,1\n1,abc\n", undefined, 400, /Row 3, column "v": "abc" is not a number/],
      ["t,v\n0,1\n1,NaN\n", undefined, 400, /Row 3, column "v": "NaN"/],
      ["t,v\n0,1\n0.5,2\n0.5,3\n", undefined, 400, /Row 4, column "t".*strictly increasing/],
      ["t,v\n0,1\n1,2\n", { timeColumn: "time", voltsColumn: "v" }, 400, /no column named "time"/],
      ["t,v\n0,1\n1,2\n", { timeColumn: "t", voltsColumn: "9" }, 400, /voltsColumn: column 9 does not exist/],
      ["t,v\n0,1\n1,2\n", { timeColumn: "t", voltsColumn: "v", timeUnit: "fortnight" }, 400, /timeUnit/],
      ['t,v\n0,"1\n1,2\n', undefined, 400, /Row|not a number|Quote/i],
      [new Blob([new Uint8Array([0xff, 0xfe, 0x00, 0x01, 0x02])]), undefined, 400, /not a text CSV/],
      [
        "t,v\n" + Array.from({ length: 200_001 }, (_, i) => `${i},0`).join("\n"),
        undefined,
        413,
        /200,001 data rows; at most 200,000/,
      ],
      ["t,v\n" + "0.000000,0.000000\n".repeat(300_000), undefined, 413, /larger than 5 MB/],
    ];
    for (const [csv, fields, status, message] of bad) {
      const res = await fx.sessions.designer.fetch("/api/captures", { method: "POST", body: form(csv, fields) });
      const body = (await res.json()) as { message: string };
      expect(res.status, body.message).toBe(status);
      expect(body.message).toMatch(message);
    }
    // Not multipart at all, and no file field.
    const raw = await fx.sessions.designer.fetch("/api/captures", {
      method: "POST",
      headers: { "content-type": "text/csv" },
      body: "t,v\n0,1\n1,2\n",
    });
    expect(raw.status).toBe(400);
    const noFile = new FormData();
    noFile.set("timeColumn", "t");
    expect((await fx.sessions.designer.fetch("/api/captures", { method: "POST", body: noFile })).status).toBe(400);
    expect(await count("/api/captures")).toBe(before);
  });

  it("a 6 MB body is refused with 413 before it is parsed", async () => {
    const big = new Blob([new Uint8Array(6 * 1024 * 1024).fill(0x31)]);
    const res = await fx.sessions.designer.fetch("/api/captures", { method: "POST", body: form(big) });
    expect(res.status).toBe(413);
  });

  it("stores a good file exactly, with the chosen columns and time unit", async () => {
    const csv = "time_ms,ch1,ch2\n0,0.10,5\n0.5,0.12,5\n1.0,3.30,4.9\n";
    const res = await fx.sessions.designer.fetch("/api/captures", {
      method: "POST",
      body: form(csv, { name: "float bounce", timeColumn: "time_ms", voltsColumn: "ch1", timeUnit: "ms" }),
    });
    expect(res.status).toBe(201);
    const created = (await res.json()) as { id: string; points: number; columns: { time: string; value: string } };
    expect(created).toMatchObject({ points: 3, columns: { time: "time_ms", value: "ch1" } });
    const full = (await (await fx.sessions.viewer.fetch(`/api/captures/${created.id}`)).json()) as {
      samples: [number, number][];
    };
    expect(full.samples).toEqual([
      [0, 0.1],
      [0.0005, 0.12],
      [0.001, 3.3],
    ]);

    // Columns by 1-based number, and the default (first = time, second = volts) when none is chosen.
    const byNumber = await fx.sessions.designer.fetch("/api/captures", {
      method: "POST",
      body: form(csv, { timeColumn: "1", voltsColumn: "3" }),
    });
    expect(byNumber.status).toBe(201);
    expect(((await byNumber.json()) as { columns: unknown }).columns).toEqual({ time: "time_ms", value: "ch2" });
    const byDefault = await fx.sessions.designer.fetch("/api/captures", {
      method: "POST",
      body: form("0,1\n0.1,2\n0.2,1.5\n", {}),
    });
    expect(byDefault.status).toBe(201);
    expect((await byDefault.json()) as { points: number; duration: number }).toMatchObject({
      points: 3,
      duration: 0.2,
    });
  });

  it("parts CSV import is all or nothing", async () => {
    const before = await count("/api/parts");
    const header = "name,openLoopGain,gainBandwidth,slewRate,outputHeadroomHigh,outputHeadroomLow,inputOffset";
    const bad = await fx.sessions.designer.fetch("/api/parts/import", {
      method: "POST",
      headers: { "content-type": "text/csv" },
      body: `${header}\ngood one,1e5,1M,1e6,0.1,0.1,1m\nbad one,1e5,fast,1e6,0.1,0.1,1m\n`,
    });
    expect(bad.status).toBe(400);
    expect(JSON.stringify(await bad.json())).toContain('Row 3, gainBandwidth: \\"fast\\" is not a number');
    expect(await count("/api/parts")).toBe(before);

    const clash = await fx.sessions.designer.fetch("/api/parts/import", {
      method: "POST",
      headers: { "content-type": "text/csv" },
      body: `${header}\nfresh one,1e5,1M,1e6,0.1,0.1,1m\ngeneral-purpose bipolar,1e5,1M,1e6,0.1,0.1,1m\n`,
    });
    expect(clash.status).toBe(409);
    expect(await count("/api/parts")).toBe(before);

    const f = new FormData();
    f.set(
      "file",
      new Blob([`${header}\nfresh one,1e5,1M,1e6,0.1,0.1,1m\nfresh two,2e5,10M,20e6,0.1,0.1,2m\n`]),
      "parts.csv",
    );
    const ok = await fx.sessions.designer.fetch("/api/parts/import", { method: "POST", body: f });
    expect(ok.status).toBe(201);
    expect(await count("/api/parts")).toBe(before + 2);
  });
});

describe("concurrency", () => {
  it("50 concurrent comments and 50 concurrent part saves lose nothing", async () => {
    const before = await count(`/api/runs/${fx.runId}/comments`);
    const writers = [fx.sessions.owner, fx.sessions.designer, fx.sessions.reviewer];
    const comments = await Promise.all(
      Array.from({ length: 50 }, (_, i) =>
        writers[i % 3].fetch(`/api/runs/${fx.runId}/comments`, {
          method: "POST",
          body: JSON.stringify({ body: `parallel comment ${i}` }),
        }),
      ),
    );
    expect(comments.map((r) => r.status)).toEqual(Array(50).fill(201));
    const list = (await (await fx.sessions.viewer.fetch(`/api/runs/${fx.runId}/comments`)).json()) as {
      items: { body: string }[];
    };
    expect(list.items.length).toBe(before + 50);
    const bodies = new Set(list.items.map((c) => c.body));
    for (let i = 0; i < 50; i++) expect(bodies.has(`parallel comment ${i}`)).toBe(true);

    const partsBefore = await count("/api/parts");
    const opamp = {
      openLoopGain: 2e5,
      gainBandwidth: 1e6,
      slewRate: 5e5,
      outputHeadroomHigh: 1.5,
      outputHeadroomLow: 1.5,
      inputOffset: 1e-3,
    };
    const saves = await Promise.all(
      Array.from({ length: 50 }, (_, i) =>
        (i % 2 ? fx.sessions.owner : fx.sessions.designer).fetch("/api/parts", {
          method: "POST",
          body: JSON.stringify({ name: `parallel part ${i}`, opamp }),
        }),
      ),
    );
    expect(saves.map((r) => r.status)).toEqual(Array(50).fill(201));
    expect(await count("/api/parts")).toBe(partsBefore + 50);
  });

  it("50 concurrent scenario saves each become a version", async () => {
    const id = await firstScenarioId(fx.sessions.designer, "Hydrophone preamp");
    const before = (await (await fx.sessions.designer.fetch(`/api/scenarios/${id}`)).json()) as { version: number };
    const saves = await Promise.all(
      Array.from({ length: 50 }, (_, i) =>
        (i % 2 ? fx.sessions.owner : fx.sessions.designer).fetch(`/api/scenarios/${id}`, {
          method: "PUT",
          body: JSON.stringify({ name: `Hydrophone preamp (save ${i})`, note: `parallel save ${i}` }),
        }),
      ),
    );
    expect(saves.map((r) => r.status)).toEqual(Array(50).fill(200));
    // Each answer carries the version that save wrote (read inside its own transaction), so the
    // 50 answers name 50 different versions, exactly before+1 … before+50.
    const answered = await Promise.all(saves.map(async (r) => ((await r.json()) as { version: number }).version));
    expect([...answered].sort((a, b) => a - b)).toEqual(Array.from({ length: 50 }, (_, i) => before.version + 1 + i));
    const after = (await (await fx.sessions.viewer.fetch(`/api/scenarios/${id}`)).json()) as { version: number };
    expect(after.version).toBe(before.version + 50);
    const versions = (await (await fx.sessions.viewer.fetch(`/api/scenarios/${id}/versions`)).json()) as {
      items: { version: number; note?: string | null }[];
    };
    const numbers = versions.items.map((v) => v.version).sort((a, b) => a - b);
    expect(new Set(numbers).size).toBe(numbers.length);
    for (let i = 0; i < 50; i++) expect(versions.items.some((v) => v.note === `parallel save ${i}`)).toBe(true);
  });
});

describe("mailbox page", () => {
  it("lists what the sink received (production build, no SMTP_URL)", async () => {
    const res = await fx.sessions.owner.fetch("/dev/mail");
    expect(res.status).toBe(200);
    const html = await res.text();
    expect(html).toContain("Mailbox");
    expect(html).toContain("invited you to Fjordline Aquaculture");
    // Other members see only their own mail: no invitation links for them to pick up.
    const designerView = (await (await fx.sessions.designer.fetch("/dev/mail")).text()).replace(/<!-- -->/g, "");
    expect(designerView).toContain("Approved: run");
    expect(designerView).not.toContain("invited you");
    expect(designerView).not.toContain("/invite/");
  });
});

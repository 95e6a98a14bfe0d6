// The review side of the API against the real server and a fresh database: a sign-off is a
// deliberate decision (no default, a note for changes requested, 400 naming the field and
// nothing stored), it applies to the run's scenario version and shows as out of date after a
// later save, a reviewer withdraws only their own decision, review requests mail the reviewers
// and fill their queue, run links carry a label and their last use, and audit entries name
// whom and which run. Expected values are the inputs the test itself sent (no source needed).
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startServer, type TestServer } from "@/tests/helpers/server";
import { EMAILS, createRun, readMails, setupTeam, waitForMail, type TeamFixture } from "@/tests/helpers/team";

let server: TestServer;
let fx: TeamFixture;

beforeAll(async () => {
  server = await startServer();
  fx = await setupTeam(server);
});
afterAll(async () => {
  await server?.stop();
});

interface Issue {
  path: (string | number)[];
  message: string;
}
interface Signoff {
  id: string;
  decision: string;
  note: string;
  scenarioVersion: number | null;
  withdrawnAt: string | null;
  reviewer: { id: string | null; name: string };
}
interface QueueItem {
  run: { id: string; scenarioVersion: number | null; scenario: { id: string; version: number } };
  requests: { reviewer: { id: string }; decision: string | null }[];
  decision: Signoff | null;
  outOfDate: boolean;
}
interface Queue {
  waitingOnMe: QueueItem[];
  requestedByMe: QueueItem[];
  decided: QueueItem[];
}

const post = (body: unknown) => ({ method: "POST", body: JSON.stringify(body) });

async function signoffs(runId: string): Promise<{ items: Signoff[]; withdrawn: Signoff[] }> {
  const res = await fx.sessions.viewer.fetch(`/api/runs/${runId}/signoffs`);
  expect(res.status).toBe(200);
  return (await res.json()) as { items: Signoff[]; withdrawn: Signoff[] };
}

async function memberId(email: string): Promise<string> {
  const res = await fx.sessions.designer.fetch("/api/team/members");
  const { items } = (await res.json()) as { items: { id: string; email: string }[] };
  const hit = items.find((m) => m.email === email);
  if (!hit) throw new Error(`no member ${email}`);
  return hit.id;
}

describe("a deliberate sign-off", () => {
  it("refuses a missing decision and an empty note for changes requested, naming the field, storing nothing", async () => {
    const runId = await createRun(fx.sessions.designer, fx.scenarioId, "deliberate sign-off");
    const cases: [unknown, string][] = [
      [{}, "decision"],
      [{ note: "looks fine" }, "decision"],
      [{ decision: "approve" }, "decision"],
      [{ decision: "changes_requested" }, "note"],
      [{ decision: "changes_requested", note: "   \n " }, "note"],
      [{ decision: "changes-requested", note: "" }, "note"],
    ];
    for (const [body, field] of cases) {
      const res = await fx.sessions.reviewer.fetch(`/api/runs/${runId}/signoffs`, post(body));
      expect(res.status, JSON.stringify(body)).toBe(400);
      const err = (await res.json()) as { error: string; issues: Issue[] };
      expect(err.error).toBe("invalid_input");
      expect(
        err.issues.map((i) => i.path[0]),
        JSON.stringify(body),
      ).toContain(field);
    }
    expect((await signoffs(runId)).items).toEqual([]);

    const ok = await fx.sessions.reviewer.fetch(
      `/api/runs/${runId}/signoffs`,
      post({ decision: "changes_requested", note: "Reconnect point 0.2 V too low." }),
    );
    expect(ok.status).toBe(201);
    const created = (await ok.json()) as Signoff;
    const run = (await (await fx.sessions.viewer.fetch(`/api/runs/${runId}`)).json()) as { scenarioVersion: number };
    expect(created).toMatchObject({
      decision: "changes_requested",
      note: "Reconnect point 0.2 V too low.",
      scenarioVersion: run.scenarioVersion,
    });

    // The author's mail says what happened in words.
    const mail = await waitForMail(
      server.mailDir,
      (m) => m.to.includes(EMAILS.designer) && m.subject === 'Changes requested: run "deliberate sign-off"',
    );
    expect(mail.text).toContain('Maren Lie requested changes on your run "deliberate sign-off"');
    expect(mail.text).toContain("Reconnect point 0.2 V too low.");
    expect(mail.text).not.toContain("signed off your run");
  });

  it("lets a reviewer withdraw their own decision only; a new decision replaces their earlier one", async () => {
    const runId = await createRun(fx.sessions.designer, fx.scenarioId, "withdraw test");
    const first = (await (
      await fx.sessions.reviewer.fetch(`/api/runs/${runId}/signoffs`, post({ decision: "approved" }))
    ).json()) as Signoff;
    const second = (await (
      await fx.sessions.reviewer.fetch(
        `/api/runs/${runId}/signoffs`,
        post({ decision: "changes_requested", note: "On second look: chatter." }),
      )
    ).json()) as Signoff;
    let list = await signoffs(runId);
    expect(list.items.map((s) => s.id)).toEqual([second.id]);
    expect(list.withdrawn.map((s) => s.id)).toEqual([first.id]);

    // The owner may sign off, but not withdraw someone else's decision; a designer may not at all.
    expect(
      (await fx.sessions.owner.fetch(`/api/runs/${runId}/signoffs/${second.id}`, { method: "DELETE" })).status,
    ).toBe(403);
    expect(
      (await fx.sessions.designer.fetch(`/api/runs/${runId}/signoffs/${second.id}`, { method: "DELETE" })).status,
    ).toBe(403);
    expect(
      (await fx.sessions.other.fetch(`/api/runs/${runId}/signoffs/${second.id}`, { method: "DELETE" })).status,
    ).toBe(404);
    const gone = await fx.sessions.reviewer.fetch(`/api/runs/${runId}/signoffs/${second.id}`, { method: "DELETE" });
    expect(gone.status).toBe(200);
    expect(((await gone.json()) as Signoff).withdrawnAt).not.toBeNull();
    expect(
      (await fx.sessions.reviewer.fetch(`/api/runs/${runId}/signoffs/${second.id}`, { method: "DELETE" })).status,
    ).toBe(409);
    list = await signoffs(runId);
    expect(list.items).toEqual([]);
    expect(list.withdrawn).toHaveLength(2);
  });
});

describe("review requests, the queue and out-of-date approvals", () => {
  it("mails the chosen reviewers, queues the run, and shows an approval out of date after the scenario is saved again", async () => {
    const reviewerId = await memberId(EMAILS.reviewer);
    const viewerId = await memberId(EMAILS.viewer);
    const runId = await createRun(fx.sessions.designer, fx.scenarioId, "queue test");

    // Only members who may sign off can be asked; a reviewer cannot ask; bad bodies name reviewerIds.
    const asViewer = await fx.sessions.designer.fetch(
      `/api/runs/${runId}/review-requests`,
      post({ reviewerIds: [viewerId] }),
    );
    expect(asViewer.status).toBe(400);
    expect(((await asViewer.json()) as { issues: Issue[] }).issues[0].path[0]).toBe("reviewerIds");
    const empty = await fx.sessions.designer.fetch(`/api/runs/${runId}/review-requests`, post({ reviewerIds: [] }));
    expect(empty.status).toBe(400);
    expect(((await empty.json()) as { issues: Issue[] }).issues[0].path[0]).toBe("reviewerIds");
    expect(
      (await fx.sessions.reviewer.fetch(`/api/runs/${runId}/review-requests`, post({ reviewerIds: [reviewerId] })))
        .status,
    ).toBe(403);

    const res = await fx.sessions.designer.fetch(
      `/api/runs/${runId}/review-requests`,
      post({ reviewerIds: [reviewerId], note: "Please check the reconnect point." }),
    );
    expect(res.status).toBe(201);
    const mail = await waitForMail(
      server.mailDir,
      (m) => m.to.includes(EMAILS.reviewer) && m.subject === 'Review requested: run "queue test"',
    );
    expect(mail.text).toContain("Please check the reconnect point.");
    expect(mail.text).toContain(`/runs/${runId}`);
    expect(mail.text).toContain("/review");
    // Asking again does not mail again.
    expect(
      (await fx.sessions.designer.fetch(`/api/runs/${runId}/review-requests`, post({ reviewerIds: [reviewerId] })))
        .status,
    ).toBe(201);
    await new Promise((r) => setTimeout(r, 500));
    expect(readMails(server.mailDir).filter((m) => m.subject === 'Review requested: run "queue test"')).toHaveLength(1);
    // (Other mails from earlier tests may still be arriving, so only this run's review mails are counted.)

    let queue = (await (await fx.sessions.reviewer.fetch("/api/review/queue")).json()) as Queue;
    expect(queue.waitingOnMe.map((i) => i.run.id)).toContain(runId);
    const designerQueue = (await (await fx.sessions.designer.fetch("/api/review/queue")).json()) as Queue;
    expect(designerQueue.requestedByMe.map((i) => i.run.id)).toContain(runId);
    expect(designerQueue.waitingOnMe.map((i) => i.run.id)).not.toContain(runId);

    expect(
      (
        await fx.sessions.reviewer.fetch(
          `/api/runs/${runId}/signoffs`,
          post({ decision: "approved", note: "Approved for layout." }),
        )
      ).status,
    ).toBe(201);
    queue = (await (await fx.sessions.reviewer.fetch("/api/review/queue")).json()) as Queue;
    expect(queue.waitingOnMe.map((i) => i.run.id)).not.toContain(runId);
    const decided = queue.decided.find((i) => i.run.id === runId)!;
    expect(decided.decision?.decision).toBe("approved");
    expect(decided.outOfDate).toBe(false);
    let scenario = (await (await fx.sessions.viewer.fetch(`/api/scenarios/${fx.scenarioId}`)).json()) as {
      version: number;
      scenario: Record<string, unknown>;
      latestDecision: { runId: string; outOfDate: boolean; scenarioVersion: number };
    };
    expect(scenario.latestDecision).toMatchObject({
      runId,
      outOfDate: false,
      scenarioVersion: decided.run.scenarioVersion,
    });

    // A later save of the scenario: the approval no longer covers the current version.
    const put = await fx.sessions.designer.fetch(`/api/scenarios/${fx.scenarioId}`, {
      method: "PUT",
      body: JSON.stringify({
        scenario: scenario.scenario,
        note: "Re-saved after review",
        baseVersion: scenario.version,
      }),
    });
    expect(put.status).toBe(200);
    scenario = (await (await fx.sessions.viewer.fetch(`/api/scenarios/${fx.scenarioId}`)).json()) as typeof scenario;
    expect(scenario.latestDecision).toMatchObject({ runId, outOfDate: true });
    queue = (await (await fx.sessions.reviewer.fetch("/api/review/queue")).json()) as Queue;
    expect(queue.decided.find((i) => i.run.id === runId)?.outOfDate).toBe(true);
  });
});

describe("run links and the audit log", () => {
  it("a link carries its label and last use; audit entries name the member and the run", async () => {
    const res = await fx.sessions.designer.fetch(
      `/api/runs/${fx.runId}/links`,
      post({ label: "bench tech at the yard", expiresInDays: 3 }),
    );
    expect(res.status).toBe(201);
    const link = (await res.json()) as { id: string; token: string; label: string; lastUsedAt: string | null };
    expect(link.label).toBe("bench tech at the yard");
    expect(link.lastUsedAt).toBeNull();
    const tooLong = await fx.sessions.designer.fetch(`/api/runs/${fx.runId}/links`, post({ label: "x".repeat(121) }));
    expect(tooLong.status).toBe(400);
    expect(((await tooLong.json()) as { issues: Issue[] }).issues[0].path[0]).toBe("label");

    const shared = await fetch(`${server.url}/api/links/${link.token}`);
    expect(shared.status).toBe(200);
    const sharedBody = (await shared.json()) as Record<string, unknown>;
    expect(sharedBody.teamId).toBeUndefined();
    expect(sharedBody.scenarioName).toBe("Battery low-voltage disconnect");
    const list = (await (await fx.sessions.designer.fetch(`/api/runs/${fx.runId}/links`)).json()) as {
      items: { id: string; label: string | null; lastUsedAt: string | null; useCount: number }[];
    };
    const mine = list.items.find((l) => l.id === link.id)!;
    expect(mine.label).toBe("bench tech at the yard");
    expect(mine.lastUsedAt).not.toBeNull();
    expect(mine.useCount).toBe(1);

    // A role change and a sign-off, then the audit log says whose role and which run.
    const viewerId = await memberId(EMAILS.viewer);
    expect(
      (
        await fx.sessions.owner.fetch(`/api/team/members/${viewerId}`, {
          method: "PATCH",
          body: JSON.stringify({ role: "designer" }),
        })
      ).status,
    ).toBe(200);
    expect(
      (
        await fx.sessions.owner.fetch(`/api/team/members/${viewerId}`, {
          method: "PATCH",
          body: JSON.stringify({ role: "viewer" }),
        })
      ).status,
    ).toBe(200);
    expect(
      (await fx.sessions.reviewer.fetch(`/api/runs/${fx.runId}/signoffs`, post({ decision: "approved" }))).status,
    ).toBe(201);
    const audit = (await (await fx.sessions.owner.fetch("/api/team/audit")).json()) as {
      items: { action: string; targetName: string | null; details: Record<string, unknown> }[];
    };
    const role = audit.items.find((e) => e.action === "member.role_changed")!;
    const viewerName = (
      (await (await fx.sessions.owner.fetch("/api/team/members")).json()) as { items: { id: string; name: string }[] }
    ).items.find((m) => m.id === viewerId)!.name;
    expect(role.targetName).toBe(viewerName);
    const signed = audit.items.find((e) => e.action === "signoff.created")!;
    expect(signed.targetName).toBe('run "team test run" of Battery low-voltage disconnect');
    expect(signed.details.decision).toBe("approved");
  });
});

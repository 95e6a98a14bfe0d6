"use client";

import { Card } from "@/components/ui/card";
import { useRun, useScenario } from "@/lib/client/hooks";
import type { RoleName } from "@/lib/schemas/team";
import { CommentsPanel } from "./comments-panel";
import { LinksPanel } from "./links-panel";
import { RequestReviewPanel } from "./request-review-panel";
import { SignoffPanel, type RunSubject } from "./signoff-panel";
import { VersionChanges } from "./version-changes";

/**
 * Everything a team does with a finished run: review requests, review state and sign-off,
 * what changed since the previous version, comments, and read-only links. Mounted on the run
 * page; each part shows only what the role may do (the route handlers enforce it anyway).
 */
export function ReviewPanel({ runId, role, userId }: { runId: string; role: RoleName; userId?: string | null }) {
  const canComment = role === "owner" || role === "designer" || role === "reviewer";
  const canSignOff = role === "owner" || role === "reviewer";
  const canShare = role === "owner" || role === "designer";
  const run = useRun(runId).data as
    | (ReturnType<typeof useRun>["data"] & { scenarioVersion?: number | null })
    | undefined;
  const scenario = useScenario(run?.scenarioId || null).data;
  const subject: RunSubject | null = run
    ? {
        label: run.label || `Run of ${run.scenario.name ?? "scenario"}`,
        scenarioName: scenario?.name ?? run.scenario.name ?? "Scenario",
        scenarioVersion: run.scenarioVersion ?? null,
        currentVersion: scenario?.version ?? null,
      }
    : null;
  const signoff = (
    <Card title="Sign-off">
      <SignoffPanel runId={runId} canSignOff={canSignOff} userId={userId} subject={subject} />
    </Card>
  );
  const requests = (
    <Card title="Review requests" description="Who was asked to review this run.">
      <RequestReviewPanel runId={runId} canRequest={canShare} userId={userId} />
    </Card>
  );
  const comments = (
    <Card title="Comments">
      <CommentsPanel runId={runId} canComment={canComment} />
    </Card>
  );
  const links = canShare ? (
    <Card title="Run links" description="Read-only view of this run for anyone holding the link.">
      <LinksPanel runId={runId} />
    </Card>
  ) : null;
  // Two stacks of cards side by side from 1024 px (one column below, in reading order), so a
  // card never sits alone in a grid row beside an empty cell. Roles that cannot share get no
  // links card: their requests card moves under the comments to keep the stacks even.
  return (
    <div className="grid items-start gap-3 lg:grid-cols-2" data-testid="review-panel">
      <div className="grid min-w-0 content-start gap-3" data-testid="review-stack">
        {signoff}
        {links ? requests : null}
      </div>
      <div className="grid min-w-0 content-start gap-3" data-testid="review-stack">
        {comments}
        {links ?? requests}
      </div>
      {run?.scenarioId && subject?.scenarioVersion ? (
        <Card title="Changes since the previous version" className="lg:col-span-2" id="version-changes">
          <VersionChanges scenarioId={run.scenarioId} version={subject.scenarioVersion} />
        </Card>
      ) : null}
    </div>
  );
}

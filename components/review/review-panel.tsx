"use client";

import { Card } from "@/components/ui/card";
import type { RoleName } from "@/lib/schemas/team";
import { CommentsPanel } from "./comments-panel";
import { LinksPanel } from "./links-panel";
import { SignoffPanel } from "./signoff-panel";

/**
 * Everything a team does with a finished run: review state and sign-off, comments, and
 * read-only links. Mounted on the run page; each part shows only what the role may do
 * (the route handlers enforce it anyway).
 */
export function ReviewPanel({ runId, role }: { runId: string; role: RoleName }) {
  const canComment = role === "owner" || role === "designer" || role === "reviewer";
  const canSignOff = role === "owner" || role === "reviewer";
  const canShare = role === "owner" || role === "designer";
  return (
    <div className={`grid items-start gap-3 ${canShare ? "lg:grid-cols-3" : "lg:grid-cols-2"}`} data-testid="review-panel">
      <Card title="Sign-off">
        <SignoffPanel runId={runId} canSignOff={canSignOff} />
      </Card>
      <Card title="Comments">
        <CommentsPanel runId={runId} canComment={canComment} />
      </Card>
      {canShare && (
        <Card title="Run links" description="Read-only view of this run for anyone holding the link.">
          <LinksPanel runId={runId} />
        </Card>
      )}
    </div>
  );
}

"use client";

import Link from "next/link";
import { Badge } from "@/components/ui/badge";
import { Card } from "@/components/ui/card";
import { formatDate } from "@/components/ui/format";
import { LoadError, LoadingRows } from "@/components/ui/load-state";
import { PageHeader } from "@/components/ui/page-header";
import { Table, TBody, TD, TH, THead, TR } from "@/components/ui/table";
import { useReviewQueue } from "@/lib/client/review-hooks";
import type { QueueItem } from "@/lib/schemas/review";
import type { RoleName } from "@/lib/schemas/team";
import { ReviewStateBadge } from "./review-state-badge";

function QueueTable({
  items,
  caption,
  empty,
  show,
}: {
  items: QueueItem[];
  caption: string;
  empty: string;
  show: "requests" | "decision";
}) {
  if (items.length === 0) return <p className="px-4 py-3 text-[13px] text-ink-mute">{empty}</p>;
  return (
    <Table aria-label={caption} stack>
      <THead>
        <TR>
          <TH>Run</TH>
          <TH>Scenario</TH>
          <TH numeric>Version</TH>
          <TH>{show === "requests" ? "Asked" : "Decision"}</TH>
          <TH>State</TH>
        </TR>
      </THead>
      <TBody>
        {items.map((item) => (
          <TR key={item.run.id}>
            <TD className="sm:min-w-44">
              <Link
                href={`/runs/${item.run.id}`}
                className="font-medium text-ink hover:text-copper-deep hover:underline"
              >
                {item.run.label || "Run"}
              </Link>
              <div className="text-[12px] text-ink-faint">{formatDate(item.run.createdAt)}</div>
            </TD>
            {/* One wrapper per cell: on a phone each cell is a "label … value" line (Table stack). */}
            <TD className="sm:min-w-44" label="Scenario">
              <div>
                <Link href={`/scenarios/${item.run.scenario.id}`} className="text-ink-soft hover:underline">
                  {item.run.scenario.name}
                </Link>
                <div className="text-[12px] text-ink-faint">{item.run.scenario.boardName}</div>
              </div>
            </TD>
            <TD numeric className="whitespace-nowrap" label="Version">
              <div>
                {item.run.scenarioVersion ? `v${item.run.scenarioVersion}` : "—"}
                {item.run.scenarioVersion && item.run.scenario.version > item.run.scenarioVersion ? (
                  <div className="text-[12px] text-ink-faint">now v{item.run.scenario.version}</div>
                ) : null}
              </div>
            </TD>
            <TD className="text-[13px]" label={show === "requests" ? "Asked" : "Decision"}>
              {show === "requests" ? (
                <ul className="flex flex-col gap-0.5">
                  {item.requests.map((r) => (
                    <li key={r.id}>
                      {r.reviewer.name}
                      <span className="text-ink-faint">
                        {" "}
                        · by {r.requestedBy.name}, {formatDate(r.createdAt)}
                      </span>
                      {r.decision === null ? <span className="text-ink-mute"> · waiting</span> : null}
                    </li>
                  ))}
                </ul>
              ) : item.decision ? (
                <span>
                  {item.decision.reviewer.name}
                  <span className="text-ink-faint"> · {formatDate(item.decision.createdAt)}</span>
                </span>
              ) : (
                "—"
              )}
            </TD>
            <TD label="State">
              <span className="flex flex-wrap items-center gap-1">
                <ReviewStateBadge decision={item.decision?.decision ?? null} />
                {item.outOfDate && (
                  <Badge tone="alert" title="The scenario was saved again after the decided version">
                    out of date
                  </Badge>
                )}
              </span>
            </TD>
          </TR>
        ))}
      </TBody>
    </Table>
  );
}

/** The review queue: waiting on me, what I asked others to review, and decided runs. */
export function ReviewQueueView({ role }: { role: RoleName }) {
  const { data, error, isLoading, mutate } = useReviewQueue();
  const signs = role === "owner" || role === "reviewer";
  return (
    <div className="space-y-4" data-testid="review-queue">
      <PageHeader
        title="Review queue"
        description="Runs submitted for review with “Request review” on a run page, and what was decided. An approval covers the scenario version of its run."
      />
      {error ? (
        <LoadError message={String((error as Error)?.message ?? error)} onRetry={() => void mutate()} />
      ) : isLoading || !data ? (
        <LoadingRows rows={5} />
      ) : (
        <>
          <Card title={`Waiting on me (${data.waitingOnMe.length})`} padded={false} id="waiting-on-me">
            <QueueTable
              items={data.waitingOnMe}
              caption="Waiting on me"
              show="requests"
              empty={
                signs ? "Nothing is waiting on your decision." : "Your role does not sign off, so nothing waits on you."
              }
            />
          </Card>
          <Card title={`Requested by me (${data.requestedByMe.length})`} padded={false}>
            <QueueTable
              items={data.requestedByMe}
              caption="Requested by me"
              show="requests"
              empty="You have not asked anyone to review a run."
            />
          </Card>
          <Card title={`Decided (${data.decided.length})`} padded={false}>
            <QueueTable
              items={data.decided}
              caption="Decided"
              show="decision"
              empty="No run has a standing decision yet."
            />
          </Card>
        </>
      )}
    </div>
  );
}

"use client";

import Link from "next/link";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { Badge } from "@/components/ui/badge";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { EmptyState } from "@/components/ui/empty-state";
import { formatDate, formatRelative } from "@/components/ui/format";
import { LoadError, LoadingRows, NotFoundCard } from "@/components/ui/load-state";
import { PageHeader } from "@/components/ui/page-header";
import { Table, TBody, TD, TH, THead, TR } from "@/components/ui/table";
import { useToast } from "@/components/ui/toast";
import { STAGE_KIND_LABEL, STAGE_KIND_SHORT } from "@/lib/workbench/stage-labels";
import { HttpError, errorMessage } from "@/lib/client/fetcher";
import { personName, useBoard, useScenarios, type LatestDecision, type ScenarioRecord } from "@/lib/client/hooks";
import type { Supply } from "@/lib/schemas/scenario";
import { useReviewQueue } from "@/lib/client/review-hooks";
import type { ReviewQueue } from "@/lib/schemas/review";
import { DeleteScenarioDialog, NewScenarioDialog, RenameScenarioDialog } from "./scenario-dialogs";

/** Per scenario: runs waiting for a requested review (any reviewer) on this board. */
function waitingByScenario(queue: ReviewQueue | undefined): Map<string, number> {
  const out = new Map<string, number>();
  if (!queue) return out;
  const seen = new Set<string>();
  for (const item of [...queue.waitingOnMe, ...queue.requestedByMe, ...queue.decided]) {
    if (seen.has(item.run.id)) continue;
    seen.add(item.run.id);
    const open = item.requests.filter((r) => r.decision === null).length;
    if (open > 0) out.set(item.run.scenario.id, (out.get(item.run.scenario.id) ?? 0) + open);
  }
  return out;
}

export interface BoardViewProps {
  boardId: string;
  /** Owner and designer: create, rename, delete. Reviewer and viewer read only. */
  canEdit: boolean;
}

export function BoardView({ boardId, canEdit }: BoardViewProps) {
  const router = useRouter();
  const toast = useToast();
  const board = useBoard(boardId);
  const list = useScenarios(boardId);
  const queue = useReviewQueue(boardId);
  const waiting = waitingByScenario(queue.data);
  const [creating, setCreating] = useState(false);
  const [renaming, setRenaming] = useState<ScenarioRecord | null>(null);
  const [deleting, setDeleting] = useState<ScenarioRecord | null>(null);

  if (board.error instanceof HttpError && board.error.status === 404) return <NotFoundCard title="Board not found" />;

  const scenarios = list.data?.items ?? [];

  return (
    <>
      <PageHeader
        eyebrow={
          <Link href="/boards" className="hover:text-ink hover:underline">
            Boards
          </Link>
        }
        title={board.data?.name ?? (board.isLoading ? "…" : "Board")}
        description={board.data?.description || undefined}
        actions={
          canEdit && (
            <Button variant="primary" onClick={() => setCreating(true)} disabled={!list.data}>
              New scenario
            </Button>
          )
        }
      />

      {board.error && !(board.error instanceof HttpError && board.error.status === 404) && (
        <div className="mb-3">
          <LoadError message={errorMessage(board.error)} onRetry={() => void board.mutate()} />
        </div>
      )}

      <Card title="Scenarios" description={list.data ? `${scenarios.length} on this board` : undefined} padded={false}>
        {list.error ? (
          <div className="p-4">
            <LoadError message={errorMessage(list.error)} onRetry={() => void list.mutate()} />
          </div>
        ) : list.isLoading ? (
          <LoadingRows rows={5} />
        ) : scenarios.length === 0 ? (
          <EmptyState
            title="No scenarios on this board"
            action={
              canEdit && (
                <Button variant="primary" onClick={() => setCreating(true)}>
                  New scenario
                </Button>
              )
            }
          >
            A scenario is one stage with its supplies, part profile, input signal and run settings.
          </EmptyState>
        ) : (
          <>
            {/* Phones get a stacked list; the table needs room for its seven columns. */}
            <ul className="divide-y divide-paper-line sm:hidden" data-testid="scenario-list">
              {scenarios.map((s) => (
                <li key={s.id} className="flex flex-col gap-1.5 px-4 py-3">
                  <div className="flex items-start justify-between gap-3">
                    <Link
                      href={`/scenarios/${s.id}`}
                      className="font-medium text-ink hover:text-copper-deep hover:underline"
                    >
                      {s.name}
                    </Link>
                    <span className="shrink-0 font-mono text-[12px] text-ink-mute">v{s.version}</span>
                  </div>
                  <div className="flex flex-wrap items-center gap-x-3 gap-y-1 text-[12px] text-ink-mute">
                    <Badge tone="indigo">{STAGE_KIND_SHORT[s.scenario.stage.kind] ?? s.scenario.stage.kind}</Badge>
                    <span className="tabular-nums text-ink-soft">{formatSupply(s.scenario.supply)}</span>
                    <span>
                      {formatRelative(s.updatedAt)} · {personName(s.updatedBy)}
                    </span>
                    <DecisionBadge decision={s.latestDecision} hideEmpty />
                    <WaitingBadge count={waiting.get(s.id)} />
                  </div>
                  {canEdit && (
                    <div className="-ml-2.5 flex gap-1">
                      <RowActions scenario={s} onRename={setRenaming} onDelete={setDeleting} />
                    </div>
                  )}
                </li>
              ))}
            </ul>
            <Table data-testid="scenario-table" className="hidden sm:table">
              <THead>
                <TR>
                  <TH>Name</TH>
                  <TH>Stage</TH>
                  <TH>Supplies</TH>
                  <TH>Updated</TH>
                  <TH numeric>Version</TH>
                  <TH>Review</TH>
                  {canEdit && (
                    <TH className="text-right">
                      <span className="sr-only">Actions</span>
                    </TH>
                  )}
                </TR>
              </THead>
              <TBody>
                {scenarios.map((s) => (
                  <TR key={s.id} className="hover:bg-paper/70">
                    <TD className="min-w-48">
                      <Link
                        href={`/scenarios/${s.id}`}
                        className="font-medium text-ink hover:text-copper-deep hover:underline"
                      >
                        {s.name}
                      </Link>
                    </TD>
                    <TD>
                      <Badge tone="indigo" title={STAGE_KIND_LABEL[s.scenario.stage.kind]}>
                        {STAGE_KIND_SHORT[s.scenario.stage.kind] ?? s.scenario.stage.kind}
                      </Badge>
                    </TD>
                    <TD className="whitespace-nowrap tabular-nums">{formatSupply(s.scenario.supply)}</TD>
                    <TD className="whitespace-nowrap">
                      <span title={formatDate(s.updatedAt)}>{formatRelative(s.updatedAt)}</span>
                      <span className="text-ink-mute"> · {personName(s.updatedBy)}</span>
                    </TD>
                    <TD numeric>v{s.version}</TD>
                    <TD>
                      <span className="flex flex-wrap items-center gap-1.5">
                        <DecisionBadge decision={s.latestDecision} />
                        <WaitingBadge count={waiting.get(s.id)} />
                      </span>
                    </TD>
                    {canEdit && (
                      <TD className="text-right whitespace-nowrap">
                        <RowActions scenario={s} onRename={setRenaming} onDelete={setDeleting} />
                      </TD>
                    )}
                  </TR>
                ))}
              </TBody>
            </Table>
          </>
        )}
      </Card>

      {canEdit && (
        <>
          <NewScenarioDialog
            open={creating}
            boardId={boardId}
            existing={scenarios}
            onClose={() => setCreating(false)}
            onCreated={(created) => {
              setCreating(false);
              toast.notify(`Scenario “${created.name}” created`, "success");
              void list.mutate();
              router.push(`/scenarios/${created.id}`);
            }}
          />
          <RenameScenarioDialog
            target={renaming}
            onClose={() => setRenaming(null)}
            onDone={(updated) => {
              setRenaming(null);
              toast.notify(`Renamed to “${updated.name}”`, "success");
              void list.mutate();
            }}
          />
          <DeleteScenarioDialog
            target={deleting}
            onClose={() => setDeleting(null)}
            onDone={(gone) => {
              setDeleting(null);
              toast.notify(`Deleted “${gone.name}”`);
              void list.mutate((cur) => (cur ? { items: cur.items.filter((x) => x.id !== gone.id) } : cur), {
                revalidate: true,
              });
            }}
          />
        </>
      )}
    </>
  );
}

/** "±5 V" for a symmetric pair, else "+5 V / 0 V", "+12 V / −5 V". */
export function formatSupply(s: Supply): string {
  const v = (x: number) => {
    const t = String(Number(x.toPrecision(4)));
    return x > 0 ? `+${t}` : t.replace("-", "−");
  };
  if (s.negative < 0 && s.negative === -s.positive) return `±${String(Number(s.positive.toPrecision(4)))} V`;
  return `${v(s.positive)} V / ${v(s.negative)} V`;
}

function RowActions({
  scenario,
  onRename,
  onDelete,
}: {
  scenario: ScenarioRecord;
  onRename: (s: ScenarioRecord) => void;
  onDelete: (s: ScenarioRecord) => void;
}) {
  return (
    <>
      <Button size="sm" variant="ghost" onClick={() => onRename(scenario)} aria-label={`Rename ${scenario.name}`}>
        Rename
      </Button>
      <Button
        size="sm"
        variant="quiet-danger"
        onClick={() => onDelete(scenario)}
        aria-label={`Delete ${scenario.name}`}
      >
        Delete
      </Button>
    </>
  );
}

function WaitingBadge({ count }: { count?: number }) {
  if (!count) return null;
  return (
    <Badge tone="indigo" title="Requested reviews without a decision yet">
      {count} review{count === 1 ? "" : "s"} waiting
    </Badge>
  );
}

type DecisionWithVersion = LatestDecision & { scenarioVersion?: number | null; outOfDate?: boolean };

function DecisionBadge({ decision, hideEmpty }: { decision?: DecisionWithVersion | null; hideEmpty?: boolean }) {
  if (!decision) return hideEmpty ? null : <span className="text-ink-faint">—</span>;
  const d = String(decision.decision).replace(/_/g, "-");
  const v = decision.scenarioVersion ? ` v${decision.scenarioVersion}` : "";
  const badge =
    d === "approved" ? (
      <Badge tone="moss">approved{v}</Badge>
    ) : d === "changes-requested" ? (
      <Badge tone="caution">changes requested{v}</Badge>
    ) : (
      <Badge>{d}</Badge>
    );
  if (!decision.outOfDate) return badge;
  return (
    <span className="inline-flex items-center gap-1" data-testid="decision-out-of-date">
      {badge}
      <Badge tone="alert" title="The scenario was saved again after the decided version">
        out of date
      </Badge>
    </span>
  );
}

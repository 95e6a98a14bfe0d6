"use client";
// The scenario screen for reviewers and viewers: the readable tables plus the saved runs with
// their plots and readings. No edit controls.
import Link from "next/link";
import { useState } from "react";
import { Card } from "@/components/ui/card";
import { ScenarioReadView } from "@/components/scenario/scenario-read-view";
import { RunResultPanels } from "@/components/run/run-view";
import { formatQuantity } from "@/lib/design/notation";
import { personName, useRun, useRuns } from "@/lib/client/hooks";
import { cx } from "@/components/ui/cx";

export function ScenarioReadOnly({ scenarioId }: { scenarioId: string }) {
  const runs = useRuns(scenarioId);
  const items = [...(runs.data?.items ?? [])].sort((a, b) => (a.createdAt < b.createdAt ? 1 : -1));
  const [picked, setPicked] = useState<string | null>(null);
  const current = items.find((r) => r.id === picked) ?? items[0] ?? null;
  return (
    <div className="space-y-4" data-testid="scenario-readonly">
      <ScenarioReadView scenarioId={scenarioId} />
      <Card title="Runs" description="Saved runs of this scenario, as the server measured them." padded={false}>
        {items.length ? (
          <ul className="flex flex-wrap gap-1.5 px-4 py-2.5">
            {items.map((r) => (
              <li key={r.id}>
                <button
                  type="button"
                  onClick={() => setPicked(r.id)}
                  className={cx(
                    "rounded border px-2 py-1 text-left text-[12.5px]",
                    current?.id === r.id
                      ? "border-copper bg-copper-soft/50 text-ink"
                      : "border-paper-line bg-white text-ink-soft hover:border-ink-faint",
                  )}
                >
                  {r.label || `Run ${r.id.slice(0, 8)}`}
                  <span className="ml-2 text-[11px] text-ink-mute">
                    {r.createdAt.slice(0, 10)} · {personName(r.createdBy)}
                    {r.result?.metrics.upperThreshold != null
                      ? ` · upper ${formatQuantity(r.result.metrics.upperThreshold, "V", 4)}`
                      : ""}
                  </span>
                </button>
              </li>
            ))}
          </ul>
        ) : (
          <p className="px-4 py-3 text-[13px] text-ink-mute">{runs.isLoading ? "Loading…" : "No saved runs yet."}</p>
        )}
      </Card>
      {current ? (
        <div className="space-y-2">
          <p className="text-[13px] text-ink-mute">
            Showing <span className="text-ink">{current.label || `run ${current.id.slice(0, 8)}`}</span> ·{" "}
            <Link href={`/runs/${current.id}`} className="text-copper-deep hover:underline">
              open the run page
            </Link>
          </p>
          <PickedRun id={current.id} />
        </div>
      ) : null}
    </div>
  );
}

/** The list holds summaries only; the samples come with the run itself. */
function PickedRun({ id }: { id: string }) {
  const { data, error } = useRun(id);
  if (error)
    return (
      <p className="text-[13px] text-alert">Could not load the run: {String((error as Error).message ?? error)}</p>
    );
  if (!data) return <p className="text-[13px] text-ink-mute">Loading the run…</p>;
  return <RunResultPanels key={data.id} run={data} />;
}

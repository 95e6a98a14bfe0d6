"use client";
// "History" (versions: list, view, restore) and "Runs" (saved runs of this scenario).
import Link from "next/link";
import { useState } from "react";
import useSWR, { useSWRConfig } from "swr";
import { Card } from "@/components/ui/card";
import { Badge } from "@/components/ui/badge";
import { formatQuantity } from "@/lib/design/notation";
import { fetchJson, errorMessage } from "@/lib/client/fetcher";
import { personName, useRuns, type ListResponse } from "@/lib/client/hooks";
import { ScenarioTables } from "@/components/scenario/scenario-tables";
import { parseScenario } from "@/lib/schemas/scenario";
import { fetchVersion, restoreVersion, scenarioKey, versionsKey, type VersionRecord } from "./api";
import { MiniButton } from "./controls";
import { useWb } from "./store";

function when(iso: string): string {
  const d = new Date(iso);
  return Number.isNaN(d.getTime()) ? iso : d.toISOString().slice(0, 16).replace("T", " ") + " UTC";
}

export function HistoryCard({ canEdit }: { canEdit: boolean }) {
  const scenarioId = useWb((s) => s.scenarioId);
  const current = useWb((s) => s.version);
  const markSaved = useWb((s) => s.markSaved);
  const setNotice = useWb((s) => s.setNotice);
  const { mutate } = useSWRConfig();
  const {
    data,
    error,
    isLoading,
    mutate: reload,
  } = useSWR<ListResponse<VersionRecord>>(versionsKey(scenarioId), (u: string) => fetchJson(u), {
    revalidateOnFocus: false,
  });
  const [viewing, setViewing] = useState<VersionRecord | null>(null);
  const [busy, setBusy] = useState<number | null>(null);
  const items = [...(data?.items ?? [])].sort((a, b) => b.version - a.version);

  const view = async (v: VersionRecord) => {
    if (viewing?.version === v.version) return setViewing(null);
    try {
      setViewing(v.scenario ? v : await fetchVersion(scenarioId, v.version));
    } catch (e) {
      setNotice({ tone: "error", text: errorMessage(e) });
    }
  };
  const restore = async (v: number) => {
    setBusy(v);
    try {
      const rec = await restoreVersion(scenarioId, v);
      markSaved(parseScenario(rec.scenario), rec.version);
      await Promise.all([reload(), mutate(scenarioKey(scenarioId))]);
      setNotice({ tone: "ok", text: `Version ${v} restored as version ${rec.version}.` });
    } catch (e) {
      setNotice({ tone: "error", text: errorMessage(e) });
    } finally {
      setBusy(null);
    }
  };

  return (
    <Card
      title="History"
      description="Every save is a version; restoring one saves it again as the newest."
      padded={false}
      // A version being viewed gets the full width: its tables need it.
      className={viewing?.scenario ? "min-w-0 xl:col-span-2" : "min-w-0"}
    >
      {error ? (
        <p className="px-4 py-3 text-[13px] text-alert">Could not load versions: {errorMessage(error)}</p>
      ) : isLoading ? (
        <p className="px-4 py-3 text-[13px] text-ink-mute">Loading…</p>
      ) : (
        <ul className="max-h-[320px] divide-y divide-paper-line overflow-auto" data-testid="history">
          {items.map((v) => (
            <li key={v.version} className="px-4 py-1.5">
              <div className="flex items-center justify-between gap-2 text-[13px]">
                <span className="min-w-0 leading-snug">
                  <span className="mr-2 font-mono text-ink">v{v.version}</span>
                  {v.version === current ? <Badge tone="copper">current</Badge> : null}{" "}
                  <span className="text-ink-mute">
                    {when(v.createdAt)} · {personName(v.author ?? v.updatedBy ?? v.createdBy)}
                    {v.note ? ` · ${v.note}` : ""}
                  </span>
                </span>
                <span className="flex shrink-0 gap-1">
                  <MiniButton onClick={() => void view(v)}>
                    {viewing?.version === v.version ? "Hide" : "View"}
                  </MiniButton>
                  {canEdit && v.version !== current ? (
                    <MiniButton disabled={busy !== null} onClick={() => void restore(v.version)}>
                      {busy === v.version ? "Restoring…" : "Restore"}
                    </MiniButton>
                  ) : null}
                </span>
              </div>
            </li>
          ))}
          {!items.length ? <li className="px-4 py-3 text-[13px] text-ink-mute">No versions yet.</li> : null}
        </ul>
      )}
      {/* The version viewed, below the list at the card's full width (the card spans both columns
          then) and its full height: not a scroll box inside the list's own scroll box. */}
      {viewing?.scenario ? (
        <section
          className="border-t border-paper-line px-4 pt-2 pb-3 text-[12px]"
          aria-label={`Version ${viewing.version} as saved`}
          data-testid="history-snapshot"
        >
          <h3 className="mb-1.5 text-[12px] font-semibold text-ink-soft">Version {viewing.version} as saved</h3>
          <ScenarioTables scenario={viewing.scenario} />
        </section>
      ) : null}
    </Card>
  );
}

export function RunsCard({ action }: { action?: React.ReactNode }) {
  const scenarioId = useWb((s) => s.scenarioId);
  const { data, error, isLoading } = useRuns(scenarioId);
  const items = [...(data?.items ?? [])].sort((a, b) => (a.createdAt < b.createdAt ? 1 : -1));
  return (
    <Card
      title="Runs"
      description="Saved runs are re-run on the server and kept unchanged."
      actions={action}
      padded={false}
      className="min-w-0"
    >
      {error ? (
        <p className="px-4 py-3 text-[13px] text-alert">Could not load runs: {errorMessage(error)}</p>
      ) : isLoading ? (
        <p className="px-4 py-3 text-[13px] text-ink-mute">Loading…</p>
      ) : items.length ? (
        <div className="max-h-[320px] overflow-auto">
          <table className="w-full border-collapse text-[13px]" data-testid="runs-table">
            <thead className="sticky top-0 bg-paper-card">
              <tr className="border-b border-paper-line text-left text-[11.5px] text-ink-mute">
                <th className="px-4 py-1.5 font-medium">run · saved</th>
                <th className="px-2 py-1.5 text-right font-medium">upper</th>
                <th className="px-2 py-1.5 text-right font-medium">lower</th>
                <th className="py-1.5 pl-2 pr-4 text-right font-medium">edges</th>
              </tr>
            </thead>
            <tbody>
              {items.map((r) => (
                <tr key={r.id} className="border-b border-paper-line/70 last:border-0 hover:bg-paper/60">
                  <td className="break-words px-4 py-1.5">
                    <Link href={`/runs/${r.id}`} className="text-copper-deep hover:underline">
                      {r.label || `Run ${r.id.slice(0, 8)}`}
                    </Link>
                    {/* When and by whom, under the name: a column of its own wrapped to four lines. */}
                    <span className="block text-[11.5px] text-ink-mute">
                      <span className="whitespace-nowrap">{when(r.createdAt)}</span> · {personName(r.createdBy)}
                    </span>
                  </td>
                  <td className="whitespace-nowrap px-2 py-1.5 text-right font-mono">
                    {r.result?.metrics.upperThreshold == null
                      ? "—"
                      : formatQuantity(r.result.metrics.upperThreshold, "V", 4)}
                  </td>
                  <td className="whitespace-nowrap px-2 py-1.5 text-right font-mono">
                    {r.result?.metrics.lowerThreshold == null
                      ? "—"
                      : formatQuantity(r.result.metrics.lowerThreshold, "V", 4)}
                  </td>
                  <td className="whitespace-nowrap py-1.5 pl-2 pr-4 text-right font-mono">
                    {r.result?.metrics.transitions ?? "—"}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      ) : (
        <p className="px-4 py-3 text-[13px] text-ink-mute">No saved runs yet. Save one to share it with reviewers.</p>
      )}
    </Card>
  );
}

"use client";
// What changed in the scenario between the version before this run's and the run's own version
// (and, when the scenario moved on, since the run), with the authors' change notes.
import useSWR from "swr";
import { fetchJson } from "@/lib/client/fetcher";
import { formatDate } from "@/components/ui/format";
import { VersionDiffTable } from "@/components/scenario/version-diff-table";
import { personName, useScenario, type PersonRef } from "@/lib/client/hooks";

interface VersionDoc {
  version: number;
  note: string | null;
  createdAt: string;
  author: PersonRef;
  scenario: unknown;
}

const versionUrl = (id: string, v: number) => `/api/scenarios/${encodeURIComponent(id)}/versions/${v}`;
const useVersion = (id: string, v: number | null) =>
  useSWR<VersionDoc>(v && v >= 1 ? versionUrl(id, v) : null, (u: string) => fetchJson<VersionDoc>(u), {
    revalidateOnFocus: false,
  });

function NoteLine({ doc }: { doc: VersionDoc | undefined }) {
  if (!doc) return null;
  return (
    <p className="text-[12px] text-ink-mute">
      Version {doc.version} saved by {personName(doc.author)}, {formatDate(doc.createdAt)}
      {doc.note ? (
        <>
          {" "}
          · change note: <span className="text-ink-soft">“{doc.note}”</span>
        </>
      ) : (
        " · no change note"
      )}
    </p>
  );
}

export function VersionChanges({ scenarioId, version }: { scenarioId: string; version: number }) {
  const current = useScenario(scenarioId).data?.version ?? null;
  const prev = useVersion(scenarioId, version > 1 ? version - 1 : null);
  const mine = useVersion(scenarioId, version);
  const latest = useVersion(scenarioId, current && current > version ? current : null);
  if (version <= 1)
    return (
      <p className="text-[13px] text-ink-mute">
        This run is of version 1, the scenario's first version: nothing to compare with.
      </p>
    );
  if (mine.error || prev.error)
    return <p className="text-[13px] text-alert">Could not load the versions to compare.</p>;
  if (!mine.data || !prev.data) return <p className="text-[13px] text-ink-mute">Loading versions…</p>;
  return (
    <div className="flex flex-col gap-3">
      <NoteLine doc={mine.data} />
      <VersionDiffTable
        before={prev.data.scenario}
        after={mine.data.scenario}
        beforeTitle={`Version ${version - 1}`}
        afterTitle={`Version ${version} (this run)`}
        caption={`Changes from version ${version - 1} to ${version}`}
      />
      {latest.data && (
        <div className="flex flex-col gap-2 border-t border-paper-line pt-3" data-testid="changes-since-run">
          <p className="text-[13px] font-medium text-caution">
            The scenario was saved again after this run: now version {latest.data.version}.
          </p>
          <NoteLine doc={latest.data} />
          <VersionDiffTable
            before={mine.data.scenario}
            after={latest.data.scenario}
            beforeTitle={`Version ${version} (this run)`}
            afterTitle={`Version ${latest.data.version} (current)`}
            caption={`Changes since this run`}
          />
        </div>
      )}
    </div>
  );
}

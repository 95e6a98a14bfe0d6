"use client";
// Two runs side by side: what changed in the scenario between them, the Trace and the Loop
// overlaid (this run solid, the other dashed), and the readings with differences highlighted.
import Link from "next/link";
import { useRouter } from "next/navigation";
import { useMemo, useState } from "react";
import { Card } from "@/components/ui/card";
import { Select } from "@/components/ui/field";
import { formatDate } from "@/components/ui/format";
import { LoadingRows } from "@/components/ui/load-state";
import { PageHeader } from "@/components/ui/page-header";
import { PLOT_COLORS } from "@/components/plots/use-uplot";
import { VersionDiffTable } from "@/components/scenario/version-diff-table";
import { useRun, useRuns, useScenario, useScenarios, type RunRecord } from "@/lib/client/hooks";
import type { RunSummary } from "@/lib/client/runs";
import { NotFoundNote } from "./not-found-note";
import { PlotImage, type PlotSpec } from "./plot-image";
import { ReadingsCompare } from "./readings-compare";

type Versioned = Pick<RunSummary, "label" | "scenarioVersion">;

const OTHER = { input: "#8fa0d8", output: "#d9a27f" };

function runTitle(r: Versioned, fallback: string): string {
  const v = r.scenarioVersion ? ` (v${r.scenarioVersion})` : "";
  return `${r.label || fallback}${v}`;
}

export function traceOverlay(a: RunRecord, b: RunRecord): PlotSpec {
  return {
    xUnit: "s",
    yUnit: "V",
    series: [
      {
        x: b.result.samples.t,
        y: b.result.samples.input,
        color: OTHER.input,
        width: 1.3,
        dash: [5, 3],
        label: "input, compared run",
      },
      {
        x: b.result.samples.t,
        y: b.result.samples.output,
        color: OTHER.output,
        width: 1.6,
        dash: [5, 3],
        label: "output, compared run",
      },
      {
        x: a.result.samples.t,
        y: a.result.samples.input,
        color: PLOT_COLORS.input,
        width: 1.3,
        label: "input, this run",
      },
      {
        x: a.result.samples.t,
        y: a.result.samples.output,
        color: PLOT_COLORS.output,
        width: 1.8,
        label: "output, this run",
      },
    ],
  };
}

export function loopOverlay(a: RunRecord, b: RunRecord): PlotSpec {
  return {
    xUnit: "V",
    yUnit: "V",
    series: [
      {
        x: b.result.samples.input,
        y: b.result.samples.output,
        color: OTHER.output,
        width: 1.4,
        dash: [5, 3],
        label: "compared run",
      },
      {
        x: a.result.samples.input,
        y: a.result.samples.output,
        color: PLOT_COLORS.output,
        width: 1.8,
        label: "this run",
      },
    ],
  };
}

/** Choose the run to compare with: another run of this scenario, or a run of another scenario on the board. */
function ComparePicker({ run, withId }: { run: RunRecord; withId: string | null }) {
  const router = useRouter();
  const scenario = useScenario(run.scenarioId).data;
  const scenarios = useScenarios(scenario?.boardId ?? null).data?.items ?? [];
  const [scenarioId, setScenarioId] = useState(run.scenarioId);
  const runs = useRuns(scenarioId).data?.items ?? [];
  return (
    <div className="flex flex-wrap items-center gap-2 text-[13px]">
      <label htmlFor="compare-scenario" className="text-ink-soft">
        Compare with a run of
      </label>
      <Select
        id="compare-scenario"
        className="h-8! w-64! py-0 text-[13px]"
        value={scenarioId}
        onChange={(e) => setScenarioId(e.target.value)}
      >
        {(scenarios.length ? scenarios : [{ id: run.scenarioId, name: run.scenario.name ?? "this scenario" }]).map(
          (s) => (
            <option key={s.id} value={s.id}>
              {s.id === run.scenarioId ? `${s.name} (this scenario)` : s.name}
            </option>
          ),
        )}
      </Select>
      <Select
        aria-label="Run to compare with"
        className="h-8! w-80! py-0 text-[13px]"
        value={withId ?? ""}
        onChange={(e) => e.target.value && router.replace(`/runs/${run.id}/compare?with=${e.target.value}`)}
      >
        <option value="">Choose a run…</option>
        {runs
          .filter((r) => r.id !== run.id)
          .map((r) => (
            <option key={r.id} value={r.id}>
              {r.label || "Run"} · {r.scenarioVersion ? `v${r.scenarioVersion} · ` : ""}
              {formatDate(r.createdAt)}
            </option>
          ))}
      </Select>
    </div>
  );
}

export function CompareView({ runId, withId }: { runId: string; withId: string | null }) {
  const aState = useRun(runId);
  const a = aState.data;
  const siblings = useRuns(a?.scenarioId ?? null).data?.items ?? [];
  // Default: the newest earlier run of the same scenario.
  const fallback = useMemo(() => {
    if (!a) return null;
    const older = siblings.filter((r) => r.id !== a.id && r.createdAt <= a.createdAt);
    return (older[0] ?? siblings.find((r) => r.id !== a.id))?.id ?? null;
  }, [a, siblings]);
  const otherId = withId ?? fallback;
  const b = useRun(otherId).data;
  const trace = useMemo(() => (a && b ? traceOverlay(a, b) : null), [a, b]);
  const loop = useMemo(() => (a && b ? loopOverlay(a, b) : null), [a, b]);

  if (aState.error) return <NotFoundNote error={aState.error} />;
  if (!a) return <LoadingRows rows={6} />;
  const aTitle = runTitle(a, "This run");
  return (
    <div className="space-y-3" data-testid="compare-view">
      <PageHeader
        eyebrow={
          <Link href={`/runs/${a.id}`} className="hover:text-ink hover:underline">
            Run “{a.label || "run"}”
          </Link>
        }
        title="Compare runs"
        description={`This run: ${aTitle} of ${a.scenario.name ?? "its scenario"}, ${formatDate(a.createdAt)}.`}
      />
      <ComparePicker run={a} withId={otherId} />
      {!otherId ? (
        <Card>
          <p className="text-[13px] text-ink-mute">
            There is no other run of this scenario yet; choose a run of another scenario on the board.
          </p>
        </Card>
      ) : !b ? (
        <LoadingRows rows={6} />
      ) : (
        <>
          <p className="text-[13px] text-ink-soft" data-testid="compare-subjects">
            <span className="font-medium text-ink">{aTitle}</span> (solid) against{" "}
            <Link href={`/runs/${b.id}`} className="font-medium text-ink hover:underline">
              {runTitle(b, "the compared run")}
            </Link>{" "}
            of {b.scenario.name ?? "its scenario"} (dashed), {formatDate(b.createdAt)}.
          </p>
          <Card
            title="What changed in the scenario"
            description="Fields that differ between the two runs' snapshots, old → new."
          >
            <VersionDiffTable
              before={b.scenario}
              after={a.scenario}
              beforeTitle={`Compared run${b.scenarioVersion ? ` (v${b.scenarioVersion})` : ""}`}
              afterTitle={`This run${a.scenarioVersion ? ` (v${a.scenarioVersion})` : ""}`}
              caption="Scenario changes between the runs"
            />
          </Card>
          <div className="grid gap-3 xl:grid-cols-[minmax(0,1fr)_minmax(0,26rem)]">
            <div className="grid min-w-0 content-start gap-3">
              <Card title="Trace, overlaid" className="min-w-0">
                {trace && (
                  <PlotImage
                    spec={trace}
                    alt="Trace: input and output of both runs against time"
                    testId="compare-trace"
                  />
                )}
              </Card>
              <Card title="Loop, overlaid" description="Output against input" className="min-w-0">
                {loop && (
                  <PlotImage
                    spec={loop}
                    alt="Loop: output against input of both runs"
                    height={300}
                    testId="compare-loop"
                  />
                )}
              </Card>
            </div>
            <Card
              title="Readings side by side"
              description="Rows that differ are highlighted."
              className="min-w-0 self-start"
              padded={false}
            >
              <ReadingsCompare a={a.result} b={b.result} aTitle="This run" bTitle="Compared" />
            </Card>
          </div>
        </>
      )}
    </div>
  );
}

"use client";
// One stored run, read-only: its waveforms (Trace, Loop), measurements with checks and warnings,
// and the scenario snapshot it was run from. Used by /runs/[id] and by the shared-link page
// /share/[token]; both pass extra panels through the `review` and `studies` slots.
import Link from "next/link";
import { useMemo, useState, type ReactNode } from "react";
import { downloadSamplesCsv } from "@/components/plots/export";
import { Card } from "@/components/ui/card";
import { Badge } from "@/components/ui/badge";
import { Button } from "@/components/ui/button";
import { SafetyCaution } from "@/components/safety-caution";
import { ScenarioTables } from "@/components/scenario/scenario-tables";
import { STAGE_KIND_LABEL } from "@/lib/workbench/stage-labels";
import { TimePlot } from "@/components/plots/time-plot";
import { LoopPlot } from "@/components/plots/loop-plot";
import { StageDiagram } from "@/components/workbench/stage-diagram";
import { ReadingsTable } from "@/components/workbench/readings-table";
import { buildChecks, buildWarnings, designedMarks, measuredGain, minMax } from "@/lib/workbench/readings-logic";
import { capacitorOf, designedFigures, isAmplifierKind } from "@/lib/workbench/readings-logic";
import { KIND_INFO } from "@/lib/workbench/stage-kinds";
import { slug, traceSource } from "@/components/workbench/result-panels";
import { extraSampleColumns } from "@/lib/workbench/source-readings";
import { personName, type RunRecord } from "@/lib/client/hooks";

export interface RunViewProps {
  run: RunRecord;
  /** Shown to run-link holders: no links back into the team space. */
  shared?: boolean;
  /** SLOT — review: sign-off, comments and run links (team side). */
  review?: ReactNode;
  /** SLOT — studies: saved noise-margin / tolerance-spread studies of this run. */
  studies?: ReactNode;
  /** Extra controls in the title row. */
  actions?: ReactNode;
}

function when(iso: string): string {
  const d = new Date(iso);
  return Number.isNaN(d.getTime()) ? iso : d.toISOString().slice(0, 16).replace("T", " ") + " UTC";
}

export function RunView({ run, shared = false, review, studies, actions }: RunViewProps) {
  const { scenario, result } = run;
  const title = run.label || `Run of ${scenario.name ?? "scenario"}`;
  const base = slug(`${scenario.name ?? "run"}-${run.id.slice(0, 8)}`);

  const exportCsv = () => {
    const extra = extraSampleColumns(scenario, result.samples);
    downloadSamplesCsv(result.samples.t, result.samples.input, result.samples.output, `${base}-samples.csv`, extra);
  };

  return (
    <div className="space-y-3" data-testid="run-view">
      <header className="flex flex-wrap items-end justify-between gap-3">
        <div className="min-w-0">
          <p className="text-[12px] text-ink-mute">
            {shared ? (
              "Shared run · read-only"
            ) : (
              <>
                <Link href={`/scenarios/${run.scenarioId}`} className="hover:text-ink hover:underline">
                  {scenario.name ?? "Scenario"}
                </Link>{" "}
                / run
              </>
            )}
          </p>
          <h1 className="text-xl font-semibold text-ink" data-testid="run-title">
            {title}
          </h1>
          <p className="mt-0.5 flex flex-wrap items-center gap-2 text-[13px] text-ink-mute">
            <Badge tone="indigo">{STAGE_KIND_LABEL[scenario.stage.kind]}</Badge>
            <span>
              saved {when(run.createdAt)}
              {/* A link holder sees the run, not who in the team made it. */}
              {shared ? null : ` by ${personName(run.createdBy)}`}
            </span>
            {/* The separator only where the two phrases share a line (a phone wraps them apart). */}
            <span className="sm:before:mr-2 sm:before:content-['·']">
              re-run on the server ({result.solver.name}, {result.samples.t.length.toLocaleString("en")} stored samples)
            </span>
          </p>
        </div>
        <div className="flex flex-wrap gap-2">
          {actions}
          <Button size="sm" variant="secondary" onClick={exportCsv}>
            Samples CSV
          </Button>
        </div>
      </header>
      <SafetyCaution texts={[scenario.name, run.label]} />
      <RunResultPanels run={run} />
      {/* SLOT — review (team side): sign-off, comments, run links render here. */}
      {review ? <div data-slot="review">{review}</div> : null}
      {/* SLOT — studies: saved noise-margin and tolerance-spread studies render here. */}
      {studies ? <div data-slot="studies">{studies}</div> : null}
      <section aria-labelledby="snapshot-heading" className="pt-2">
        <h2 id="snapshot-heading" className="text-[13px] font-semibold uppercase tracking-wide text-ink-soft">
          Scenario snapshot
        </h2>
        <p className="mb-2 text-[13px] text-ink-mute">
          Exactly what was run; later edits to the scenario do not change this run.
        </p>
        <ScenarioTables scenario={scenario} />
      </section>
    </div>
  );
}

/** Trace, Loop, the stage as run and Readings of one stored run. */
export function RunResultPanels({ run }: { run: RunRecord }) {
  const { scenario, result } = run;
  const wf = useMemo(
    () => ({
      t: Float64Array.from(result.samples.t),
      input: Float64Array.from(result.samples.input),
      output: Float64Array.from(result.samples.output),
      filtered: result.samples.filtered ? Float64Array.from(result.samples.filtered) : null,
    }),
    [result],
  );
  const kind = scenario.stage.kind;
  const source = useMemo(() => traceSource(scenario, result.samples.source), [scenario, result]);
  // The oscillator's capacitor is drawn with its two designed switching levels (no input to compare).
  const capacitor = useMemo(() => (kind === "relaxation-oscillator" ? capacitorOf(result) : null), [kind, result]);
  const capLevels = useMemo(() => {
    if (!capacitor) return null;
    const d = designedFigures(scenario);
    return { upper: d.upperThreshold, lower: d.lowerThreshold };
  }, [capacitor, scenario]);
  const [cursorIdx, setCursorIdx] = useState<number | null>(null);
  const analysis = useMemo(() => {
    const [inputMin, inputMax] = minMax(wf.input);
    const gain = KIND_INFO[scenario.stage.kind].switching ? null : measuredGain(wf.input, wf.output, result.rails);
    return {
      thresholds: designedMarks(scenario),
      gain,
      checks: buildChecks(scenario, result.metrics, gain),
      warnings: buildWarnings({ scenario, metrics: result.metrics, rails: result.rails, inputMin, inputMax }),
    };
  }, [scenario, result, wf]);
  const base = slug(`${scenario.name ?? "run"}-${run.id.slice(0, 8)}`);
  return (
    <div className="grid gap-3 xl:grid-cols-[minmax(0,1fr)_360px]">
      <div className="grid min-w-0 content-start gap-3">
        <Card title="Trace" className="min-w-0">
          <TimePlot
            t={wf.t}
            input={wf.input}
            output={wf.output}
            rails={result.rails}
            thresholds={capLevels ?? analysis.thresholds}
            events={result.events}
            cursorIdx={cursorIdx}
            onCursor={setCursorIdx}
            showEdges={!isAmplifierKind(kind)}
            capacitor={capacitor}
            thresholdLabel={capacitor ? "switching levels of the capacitor (designed)" : undefined}
            source={source}
            filtered={wf.filtered}
            height={280}
            fileName={`${base}-trace.png`}
          />
        </Card>
        <div className="grid min-w-0 gap-3 lg:grid-cols-2">
          <Card title="Loop" description="Output against input" className="min-w-0">
            <LoopPlot
              t={wf.t}
              input={wf.input}
              output={wf.output}
              rails={result.rails}
              thresholds={analysis.thresholds}
              cursorIdx={cursorIdx}
              onCursor={setCursorIdx}
              height={250}
              fileName={`${base}-loop.png`}
            />
          </Card>
          <Card title="Stage as run" className="min-w-0">
            <StageDiagram scenario={scenario} />
          </Card>
        </div>
      </div>
      <Card title="Readings" className="min-w-0 self-start">
        <ReadingsTable
          metrics={result.metrics}
          checks={analysis.checks}
          warnings={analysis.warnings}
          gain={analysis.gain}
          solver={result.solver}
          scenario={scenario}
        />
      </Card>
    </div>
  );
}

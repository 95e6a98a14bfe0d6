"use client";
// "Trace", "Loop" and "Readings" of the workbench's latest run. The plots read the waveform
// bank (typed arrays outside the store) and share one cursor index through the store.
import { useDeferredValue, useEffect, useMemo, useState, type ReactNode } from "react";
import { Card } from "@/components/ui/card";
import { TimePlot } from "@/components/plots/time-plot";
import { LoopPlot } from "@/components/plots/loop-plot";
import {
  amplifierReadings,
  buildChecks,
  buildWarnings,
  capacitorOf,
  designedFigures,
  designedMarks,
  isAmplifierKind,
  measuredGain,
} from "@/lib/workbench/readings-logic";
import { ReadingsTable } from "./readings-table";
import { KIND_INFO } from "@/lib/workbench/stage-kinds";
import { sourceTerms } from "@/lib/workbench/source-readings";
import type { Scenario } from "@/lib/schemas/scenario";
import { markFirstPlot } from "./use-runner";
import { useCurrentWaveforms, useWb } from "./store";

/** Why the shown run no longer matches the editor, or null while it still does. */
export function useStaleReason(): string | null {
  const hasResult = useWb((s) => s.result !== null);
  const changed = useWb((s) => s.resultRevision !== s.revision);
  const invalid = useWb((s) => Object.values(s.fieldProblems).some((p) => p.scope === "scenario"));
  if (!hasResult) return null;
  if (invalid) return "Out of date: some fields are invalid. This is the last run of a valid scenario.";
  if (changed) return "Out of date: the scenario changed after this run. Press Run to update.";
  return null;
}

function StaleBadge() {
  const reason = useStaleReason();
  if (!reason) return null;
  return (
    <span
      className="rounded bg-caution-soft px-1.5 py-0.5 text-[11px] font-semibold text-ink"
      title={reason}
      data-testid="stale-result"
    >
      out of date
    </span>
  );
}

/** A dimmed body and a line saying why, while the editor no longer matches the run. */
function StaleFrame({ children }: { children: ReactNode }) {
  const reason = useStaleReason();
  return (
    <div data-stale={reason ? "true" : undefined}>
      {reason ? (
        <p className="mb-1.5 rounded border-l-[3px] border-caution bg-caution-soft/70 px-2 py-1 text-[12px] text-ink">
          {reason}
        </p>
      ) : null}
      <div className={reason ? "opacity-55" : undefined}>{children}</div>
    </div>
  );
}

function Placeholder({ text }: { text: string }) {
  return (
    <div className="flex h-[260px] items-center justify-center rounded border border-dashed border-paper-line bg-paper/50 px-6 text-center text-[13px] text-ink-mute">
      {text}
    </div>
  );
}

export function TraceCard() {
  const wf = useCurrentWaveforms();
  const result = useWb((s) => s.result);
  const cursorIdx = useWb((s) => s.cursorIdx);
  const setCursor = useWb((s) => s.setCursor);
  const kind = result?.scenario.stage.kind;
  const capacitor = useMemo(() => (kind === "relaxation-oscillator" ? capacitorOf(wf) : null), [wf, kind]);
  const thresholds = useMemo(() => {
    if (!result) return null;
    // The oscillator's two switching levels sit on its capacitor: draw them with it.
    if (capacitor) {
      const d = designedFigures(result.scenario);
      return { upper: d.upperThreshold, lower: d.lowerThreshold };
    }
    return designedMarks(result.scenario);
  }, [result, capacitor]);
  const name = result?.scenario.name ?? "scenario";
  const exportTitle = useExportLines(name);
  const source = useMemo(() => traceSource(result?.scenario ?? null, wf?.source ?? null), [result, wf]);
  return (
    <Card
      title="Trace"
      description={result ? undefined : "Input and output against time"}
      actions={<StaleBadge />}
      padded
      className="min-w-0"
    >
      {wf && result ? (
        <StaleFrame>
          <TimePlot
            t={wf.t}
            input={wf.input}
            output={wf.output}
            rails={result.rails}
            thresholds={thresholds}
            events={result.events}
            cursorIdx={cursorIdx}
            onCursor={setCursor}
            onFirstDraw={() => markFirstPlot(name, wf.t.length)}
            capacitor={capacitor}
            source={source}
            filtered={wf.filtered ?? null}
            thresholdLabel={capacitor ? "switching levels of the capacitor (designed)" : undefined}
            showEdges={!(kind && isAmplifierKind(kind))}
            exportTitle={exportTitle}
            height={290}
            fileName={`${slug(name)}-trace.png`}
          />
        </StaleFrame>
      ) : (
        <Placeholder text="Press Run (Ctrl+Enter) to simulate the stage. The input, the output, the output limits and the designed switching points appear here." />
      )}
    </Card>
  );
}

export function LoopCard() {
  // Staggered: the Trace draws first, Readings in a deferred render, the Loop one task later,
  // so no single main-thread task carries all three on a long run.
  const liveKey = useWb((s) => s.resultKey);
  const [key, setKey] = useState(liveKey);
  useEffect(() => {
    const id = setTimeout(() => setKey(liveKey), 0);
    return () => clearTimeout(id);
  }, [liveKey]);
  const live = useCurrentWaveforms();
  const liveResult = useWb((s) => s.result);
  const wf = key === liveKey ? live : null;
  const result = key === liveKey ? liveResult : null;
  const cursorIdx = useWb((s) => s.cursorIdx);
  const setCursor = useWb((s) => s.setCursor);
  const thresholds = useMemo(() => (result ? designedMarks(result.scenario) : null), [result]);
  const exportTitle = useExportLines(result?.scenario.name ?? "scenario");
  const switching = result ? KIND_INFO[result.scenario.stage.kind].switching : true;
  const oscillator = result?.scenario.stage.kind === "relaxation-oscillator";
  return (
    <Card
      title="Loop"
      description={
        switching
          ? "Output against input: the hysteresis loop"
          : "Output against input: the transfer line and its limits"
      }
      actions={<StaleBadge />}
      className="min-w-0"
    >
      {oscillator ? (
        <Placeholder text="A relaxation oscillator runs without an input, so there is no loop to draw: its switching points sit on the timing capacitor. Read the period and duty cycle in Readings." />
      ) : wf && result ? (
        <StaleFrame>
          <LoopPlot
            t={wf.t}
            input={wf.input}
            output={wf.output}
            rails={result.rails}
            thresholds={thresholds}
            cursorIdx={cursorIdx}
            onCursor={setCursor}
            height={330}
            fileName={`${slug(result.scenario.name ?? "scenario")}-loop.png`}
            exportTitle={exportTitle}
          />
        </StaleFrame>
      ) : (
        <Placeholder text="The loop is drawn from the same run." />
      )}
    </Card>
  );
}

export function ReadingsCard() {
  const wf = useDeferredValue(useCurrentWaveforms());
  const result = useDeferredValue(useWb((s) => s.result));
  const body = useMemo(() => {
    if (!result || !wf) return null;
    const kind = result.scenario.stage.kind;
    const amplifier = isAmplifierKind(kind)
      ? amplifierReadings(result.metrics, wf.input, wf.output, result.rails)
      : undefined;
    const gain = KIND_INFO[kind].switching
      ? null
      : (amplifier?.gain ?? measuredGain(wf.input, wf.output, result.rails));
    return {
      gain,
      amplifier,
      checks: buildChecks(result.scenario, result.metrics, gain),
      warnings: buildWarnings({
        scenario: result.scenario,
        metrics: result.metrics,
        rails: result.rails,
        inputMin: result.inputMin,
        inputMax: result.inputMax,
      }),
    };
  }, [result, wf]);
  return (
    <Card
      title="Readings"
      description={result ? undefined : "Measurements, checks and warnings"}
      actions={<StaleBadge />}
      className="min-w-0"
    >
      {result && body ? (
        <StaleFrame>
          <ReadingsTable
            metrics={result.metrics}
            checks={body.checks}
            warnings={body.warnings}
            gain={body.gain}
            solver={result.solver}
            scenario={result.scenario}
            rails={result.rails}
            amplifier={body.amplifier}
          />
        </StaleFrame>
      ) : (
        <p className="text-[13px] text-ink-mute">Nothing measured yet.</p>
      )}
    </Card>
  );
}

/** Lines under an exported plot's title: the scenario, which run, its version. */
function useExportLines(name: string): string[] {
  const version = useWb((s) => s.version);
  const stale = useStaleReason();
  return [
    `Scenario: ${name} (version ${version})`,
    `Run: latest Workbench run${stale ? " — out of date against the editor" : ""}`,
  ];
}

export function slug(s: string): string {
  return (
    s
      .toLowerCase()
      .replace(/[^a-z0-9]+/g, "-")
      .replace(/^-|-$/g, "") || "scenario"
  );
}

/** The Trace's source line: the input in the source's unit, labelled with its quantity. */
export function traceSource(
  scenario: Scenario | null,
  values: ArrayLike<number> | null | undefined,
): { values: Float64Array; unit: string; label: string } | null {
  if (!scenario || !values?.length) return null;
  const terms = sourceTerms(scenario);
  if (!terms) return null;
  return {
    values: values instanceof Float64Array ? values : Float64Array.from(values),
    unit: terms.unit,
    label: terms.quantity ?? "source",
  };
}

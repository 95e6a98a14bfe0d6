"use client";
// "Trace", "Loop" and "Readings" of the workbench's latest run. The plots read the waveform
// bank (typed arrays outside the store) and share one cursor index through the store.
import { useDeferredValue, useEffect, useMemo, useState } from "react";
import { Card } from "@/components/ui/card";
import { TimePlot } from "@/components/plots/time-plot";
import { LoopPlot } from "@/components/plots/loop-plot";
import { buildChecks, buildWarnings, designedMarks, measuredGain } from "./readings-logic";
import { ReadingsTable } from "./readings-table";
import { KIND_INFO } from "./stage-kinds";
import { markFirstPlot } from "./use-runner";
import { useCurrentWaveforms, useWb } from "./store";

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
  const thresholds = useMemo(() => (result ? designedMarks(result.scenario) : null), [result]);
  const name = result?.scenario.name ?? "scenario";
  return (
    <Card title="Trace" description={result ? undefined : "Input and output against time"} padded className="min-w-0">
      {wf && result ? (
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
          height={290}
          fileName={`${slug(name)}-trace.png`}
        />
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
  const switching = result ? KIND_INFO[result.scenario.stage.kind].switching : true;
  const oscillator = result?.scenario.stage.kind === "relaxation-oscillator";
  return (
    <Card title="Loop" description={switching ? "Output against input: the hysteresis loop" : "Output against input: the transfer line and its limits"} className="min-w-0">
      {oscillator ? (
        <Placeholder text="A relaxation oscillator runs without an input, so there is no loop to draw: its switching points sit on the timing capacitor. Read the period and duty cycle in Readings." />
      ) : wf && result ? (
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
        />
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
    const gain = KIND_INFO[kind].switching ? null : measuredGain(wf.input, wf.output, result.rails);
    return {
      gain,
      checks: buildChecks(result.scenario, result.metrics, gain),
      warnings: buildWarnings({ scenario: result.scenario, metrics: result.metrics, rails: result.rails, inputMin: result.inputMin, inputMax: result.inputMax }),
    };
  }, [result, wf]);
  return (
    <Card title="Readings" description={result ? undefined : "Measurements, checks and warnings"} className="min-w-0">
      {result && body ? (
        <ReadingsTable metrics={result.metrics} checks={body.checks} warnings={body.warnings} gain={body.gain} solver={result.solver} scenario={result.scenario} />
      ) : (
        <p className="text-[13px] text-ink-mute">Nothing measured yet.</p>
      )}
    </Card>
  );
}

export function slug(s: string): string {
  return s.toLowerCase().replace(/[^a-z0-9]+/g, "-").replace(/^-|-$/g, "") || "scenario";
}

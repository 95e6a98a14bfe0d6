"use client";
// Printable design summary of a scenario: the stage drawn and listed, the designed figures with
// their worst case over tolerance, offset and headroom, the measurements of the latest saved
// run, and the caution for stages that switch loads. Print CSS drops the app chrome.
import Link from "next/link";
import { useMemo, useState } from "react";
import { Card } from "@/components/ui/card";
import { LoadError, LoadingRows } from "@/components/ui/load-state";
import { Button } from "@/components/ui/button";
import { SafetyCaution, suggestsLoadSwitching, SAFETY_CAUTION_TEXT } from "@/components/safety-caution";
import { StageTable, SupplyTable, PartProfileTable, InputTable } from "@/components/scenario/scenario-tables";
import { STAGE_KIND_LABEL } from "@/lib/workbench/stage-labels";
import { errorMessage } from "@/lib/client/fetcher";
import { personName, useBoard, useRun, useRuns, useScenario } from "@/lib/client/hooks";
import type { FigureName } from "@/lib/design/analysis";
import { circuitWorstCase, type CircuitWorstCase } from "@/lib/design/spread";
import { sourceMap } from "@/lib/sim/circuit";
import { PartsList } from "@/components/circuit/parts-list";
import { formatQuantity } from "@/lib/design/notation";
import { scenarioSchema, type Scenario } from "@/lib/schemas/scenario";
import { StageDiagram } from "./stage-diagram";
import { ReadingsTable } from "./readings-table";
import { buildChecks, buildWarnings, measuredGain, minMax } from "@/lib/workbench/readings-logic";
import { KIND_INFO } from "@/lib/workbench/stage-kinds";

const FIGURE_LABEL: Record<FigureName, { label: string; unit: string }> = {
  upperThreshold: { label: "Upper switching point", unit: "V" },
  lowerThreshold: { label: "Lower switching point", unit: "V" },
  hysteresis: { label: "Deadband", unit: "V" },
  gain: { label: "Gain", unit: "V/V" },
  frequency: { label: "Frequency", unit: "Hz" },
  dutyCycle: { label: "Duty cycle", unit: "" },
};

const show = (v: number | null | undefined, unit: string) =>
  v == null || !Number.isFinite(v) ? "—" : unit ? formatQuantity(v, unit, 4) : `${(100 * v).toFixed(1)} %`;

export function DesignSummary({ scenarioId }: { scenarioId: string }) {
  const { data: record, error, isLoading } = useScenario(scenarioId);
  const board = useBoard(record?.boardId);
  const runs = useRuns(scenarioId);
  const [toleranceChoice, setTolerance] = useState<number | null>(null);

  const scenario: Scenario | null = useMemo(() => {
    if (!record) return null;
    const p = scenarioSchema.safeParse(record.scenario);
    return p.success ? p.data : null;
  }, [record]);

  // The scenario's own resistor tolerance unless the reader picks another one here.
  const tolerance = toleranceChoice ?? scenario?.tolerances?.resistor ?? 0.01;
  const figures = useMemo(() => {
    if (!scenario) return null;
    // One worst case (lib/design/spread): every part of the circuit as built, the supply and NTC
    // tolerances — the same figures the design panel and the tolerance spread study give.
    const spreadScenario = { ...scenario, tolerances: { ...(scenario.tolerances ?? {}), resistor: tolerance } };
    let worst: CircuitWorstCase | null = null;
    let problem: string | null = null;
    try {
      worst = circuitWorstCase(spreadScenario);
    } catch (e) {
      problem = e instanceof Error ? e.message : String(e);
    }
    const nominal = worst?.nominal ?? null;
    const names = nominal ? (Object.keys(FIGURE_LABEL) as FigureName[]).filter((n) => nominal[n] !== null) : [];
    const map = sourceMap(scenario);
    return { nominal, worst, names, problem, unit: map?.unit ?? null, quantity: map?.quantity ?? null };
  }, [scenario, tolerance]);

  const latestId = useMemo(
    () => [...(runs.data?.items ?? [])].sort((a, b) => (a.createdAt < b.createdAt ? 1 : -1))[0]?.id ?? null,
    [runs.data],
  );
  // The list carries summaries; the samples and snapshot come with the run itself.
  const latest = useRun(latestId).data ?? null;
  const measured = useMemo(() => {
    if (!latest) return null;
    const s = latest.scenario;
    const { input, output } = latest.result.samples;
    const [inputMin, inputMax] = minMax(input);
    const gain = KIND_INFO[s.stage.kind].switching ? null : measuredGain(input, output, latest.result.rails);
    return {
      gain,
      checks: buildChecks(s, latest.result.metrics, gain),
      warnings: buildWarnings({
        scenario: s,
        metrics: latest.result.metrics,
        rails: latest.result.rails,
        inputMin,
        inputMax,
      }),
    };
  }, [latest]);

  if (error) return <LoadError message={errorMessage(error)} />;
  if (isLoading || !record || !scenario || !figures) {
    return (
      <Card>
        <LoadingRows rows={8} />
      </Card>
    );
  }
  const switchesLoad = suggestsLoadSwitching(record.name, scenario.name);

  return (
    <article
      className="rw-summary mx-auto max-w-[920px] space-y-4 bg-paper-card p-6 print:max-w-none print:p-0"
      data-testid="design-summary"
    >
      {/* Print: only the summary — the app header, footer and these controls stay on screen. */}
      <style>{`@media print { body > div > header, body footer, nav, .rw-no-print { display: none !important; } main { max-width: none !important; padding: 0 !important; } .rw-summary { border: 0 !important; } @page { margin: 14mm; } }`}</style>
      <div className="rw-no-print flex items-center justify-between gap-2">
        <Link href={`/scenarios/${scenarioId}`} className="text-[13px] text-copper-deep hover:underline">
          ← Back to the workbench
        </Link>
        <Button size="sm" variant="primary" onClick={() => window.print()}>
          Print / save as PDF
        </Button>
      </div>
      <header className="border-b border-paper-line pb-3">
        <p className="text-[12px] uppercase tracking-wider text-ink-mute">
          Railwise design summary · {board.data?.name ?? "board"}
        </p>
        <h1 className="text-[22px] font-semibold text-ink">{record.name}</h1>
        <p className="text-[13px] text-ink-mute">
          {STAGE_KIND_LABEL[scenario.stage.kind]} · version {record.version}, saved {record.updatedAt.slice(0, 10)} by{" "}
          {personName(record.updatedBy)} · printed {new Date().toISOString().slice(0, 10)}
        </p>
      </header>
      {switchesLoad ? (
        <>
          <SafetyCaution show className="print:hidden" />
          <p className="hidden rounded border border-caution p-2 text-[12px] print:block">
            <strong>Caution — this stage switches a load.</strong> {SAFETY_CAUTION_TEXT}
          </p>
        </>
      ) : null}
      <section className="grid gap-4 md:grid-cols-[1.2fr_1fr] print:grid-cols-[1.2fr_1fr]">
        <div className="self-start rounded border border-paper-line p-2">
          <StageDiagram scenario={scenario} />
        </div>
        <StageTable scenario={scenario} />
      </section>
      <section className="grid gap-4 md:grid-cols-2 print:grid-cols-2">
        <SupplyTable scenario={scenario} />
        <PartProfileTable scenario={scenario} />
      </section>
      <section>
        <div className="mb-1 flex flex-wrap items-baseline justify-between gap-2">
          <h2 className="text-[13px] font-semibold uppercase tracking-wide text-ink-soft">
            Designed figures and worst case
          </h2>
          <label className="text-[12px] text-ink-mute">
            resistor tolerance{" "}
            <select
              className="rw-no-print rounded border border-paper-line bg-white px-1 text-[12px]"
              value={tolerance}
              onChange={(e) => setTolerance(Number(e.target.value))}
            >
              {[0.001, 0.005, 0.01, 0.02, 0.05, 0.1].map((t) => (
                <option key={t} value={t}>
                  ±{t * 100} %
                </option>
              ))}
            </select>
            <span className="hidden print:inline">±{tolerance * 100} %</span>
          </label>
        </div>
        <table className="w-full border-collapse text-[13px]" data-testid="summary-figures">
          <thead>
            <tr className="border-b border-paper-line text-left text-[11.5px] text-ink-mute">
              <th className="py-1 font-medium">figure</th>
              <th className="py-1 text-right font-medium">achieved (nominal)</th>
              <th className="py-1 text-right font-medium">worst-case low</th>
              <th className="py-1 text-right font-medium">worst-case high</th>
            </tr>
          </thead>
          <tbody>
            {figures.unit && figures.worst
              ? (["sourceUpperThreshold", "sourceLowerThreshold"] as const).map((n) => (
                  <tr key={n} className="border-b border-paper-line/60" data-figure={n}>
                    <td className="py-1 text-ink-soft">
                      {n === "sourceUpperThreshold" ? "Upper switching point" : "Lower switching point"},{" "}
                      {figures.quantity ?? "source"} ({figures.unit})
                    </td>
                    <td className="py-1 text-right font-mono">{show(figures.worst!.nominal[n], figures.unit!)}</td>
                    <td className="py-1 text-right font-mono">{show(figures.worst![n]?.[0], figures.unit!)}</td>
                    <td className="py-1 text-right font-mono">{show(figures.worst![n]?.[1], figures.unit!)}</td>
                  </tr>
                ))
              : null}
            {figures.names.map((n) => {
              const w = figures.worst?.[n] ?? null;
              return (
                <tr key={n} className="border-b border-paper-line/60">
                  <td className="py-1 text-ink-soft">
                    {FIGURE_LABEL[n].label}
                    {figures.unit && FIGURE_LABEL[n].unit === "V" ? " at the stage input" : ""}
                  </td>
                  <td className="py-1 text-right font-mono">{show(figures.nominal?.[n], FIGURE_LABEL[n].unit)}</td>
                  <td className="py-1 text-right font-mono">{show(w?.[0], FIGURE_LABEL[n].unit)}</td>
                  <td className="py-1 text-right font-mono">{show(w?.[1], FIGURE_LABEL[n].unit)}</td>
                </tr>
              );
            })}
          </tbody>
        </table>
        <p className="mt-1 text-[11.5px] text-ink-mute">
          {figures.problem
            ? `Worst case not available: ${figures.problem}`
            : `Corners over every part of the circuit (${figures.worst?.varied.map((v) => v.name).join(", ") || "none"}), input offset ±${formatQuantity(Math.abs(scenario.opamp.inputOffset), "V")} and ±20 % output headroom (${figures.worst?.corners ?? 0} corners).`}
        </p>
      </section>
      <PartsList scenario={scenario} fileName={`${record.name.replace(/[^\w.-]+/g, "-")}-parts.csv`} />
      <section>
        <h2 className="mb-1 text-[13px] font-semibold uppercase tracking-wide text-ink-soft">Measurements</h2>
        {latest && measured ? (
          <>
            <p className="mb-2 text-[12px] text-ink-mute">
              From the latest saved run, “{latest.label || latest.id.slice(0, 8)}”,{" "}
              {latest.createdAt.slice(0, 16).replace("T", " ")} UTC (re-run on the server).
            </p>
            <ReadingsTable
              metrics={latest.result.metrics}
              checks={measured.checks}
              warnings={measured.warnings}
              gain={measured.gain}
              solver={latest.result.solver}
              scenario={latest.scenario}
            />
          </>
        ) : (
          <p className="text-[13px] text-ink-mute">
            No saved run yet: save a run on the workbench to include measurements.
          </p>
        )}
      </section>
      <section className="break-inside-avoid">
        <InputTable scenario={scenario} />
      </section>
    </article>
  );
}

"use client";
// The design review report of one run: what a lead files. Stage diagram, parts list, spec vs
// designed vs worst case vs measured, the studies' verdicts, Trace and Loop as images, warnings
// and the safety caution, review requests, sign-offs and comments with names and dates, and the
// run's address. Laid out for paper: it prints to A4 and Letter (print CSS below).
import Link from "next/link";
import { useMemo, type ReactNode } from "react";
import { Button } from "@/components/ui/button";
import { formatDate } from "@/components/ui/format";
import { LoadingRows } from "@/components/ui/load-state";
import { PLOT_COLORS } from "@/components/plots/use-uplot";
import { SafetyCaution, suggestsLoadSwitching } from "@/components/safety-caution";
import { STAGE_KIND_LABEL } from "@/lib/workbench/stage-labels";
import { StageDiagram } from "@/components/workbench/stage-diagram";
import {
  buildChecks,
  buildWarnings,
  designedFigures,
  designedMarks,
  measuredGain,
  minMax,
} from "@/lib/workbench/readings-logic";
import { KIND_INFO } from "@/lib/workbench/stage-kinds";
import { billOfMaterials } from "@/lib/design/bom";
import { type CircuitWorstCase, circuitWorstCase } from "@/lib/design/spread";
import { formatQuantity } from "@/lib/design/notation";
import { personName, useRun, useScenario } from "@/lib/client/hooks";
import { errorMessage } from "@/lib/client/fetcher";
import { useComments, useRunLinks } from "@/lib/client/team-hooks";
import { useReviewRequests, useSignoffList } from "@/lib/client/review-hooks";
import { DECISION_LABEL } from "@/lib/schemas/team";
import type { SavedStudy } from "@/lib/studies/saved";
import { NotFoundNote } from "./not-found-note";
import { PlotImage, type PlotSpec } from "./plot-image";
import { contentKeys } from "@/lib/workbench/row-ids";

const PRINT_CSS = `
@page { margin: 13mm 12mm 14mm; }
@media print {
  html, body { background: #fff !important; }
  header:has(nav[aria-label="Main"]), body footer, [data-print-hide] { display: none !important; }
  main { max-width: none !important; padding: 0 !important; margin: 0 !important; }
  .report-page { box-shadow: none !important; border: 0 !important; padding: 0 !important; max-width: none !important; }
  .report-section { break-inside: avoid; }
  .report-break { break-before: page; }
  a { color: inherit !important; text-decoration: none !important; }
}`;

const v = (x: number | null | undefined, unit: string) =>
  x == null || !Number.isFinite(x) ? "—" : formatQuantity(x, unit, 4);
const pct = (x: number | null | undefined) => (x == null ? "—" : `${Number((x * 100).toPrecision(3))} %`);

function Section({ title, children, className = "" }: { title: string; children: ReactNode; className?: string }) {
  return (
    <section className={`report-section border-t border-paper-line pt-3 ${className}`}>
      <h2 className="mb-2 text-[13px] font-semibold uppercase tracking-wide text-ink-soft">{title}</h2>
      {children}
    </section>
  );
}

function SmallTable({ head, rows, label }: { head: string[]; rows: ReactNode[][]; label: string }) {
  // A static table: the header names key the columns, the first cell keys a row.
  const colKeys = contentKeys(head);
  const rowKeys = contentKeys(rows, (r) => (typeof r[0] === "string" ? r[0] : "row"));
  return (
    <table className="w-full border-collapse text-[12px]" aria-label={label}>
      <thead>
        <tr>
          {head.map((h, i) => (
            <th
              key={colKeys[i]}
              className={`border-b border-paper-line px-1.5 py-1 font-medium text-ink-soft ${i === 0 ? "text-left" : "text-right"}`}
            >
              {h}
            </th>
          ))}
        </tr>
      </thead>
      <tbody>
        {rows.map((r, i) => (
          <tr key={rowKeys[i]} className="align-top">
            {r.map((c, j) => (
              <td
                key={colKeys[j] ?? `extra${j}`}
                className={`border-b border-paper-line/60 px-1.5 py-1 ${j === 0 ? "text-left" : "text-right font-mono whitespace-nowrap"}`}
              >
                {c}
              </td>
            ))}
          </tr>
        ))}
      </tbody>
    </table>
  );
}

function range(
  w: CircuitWorstCase | null,
  key: keyof Omit<CircuitWorstCase, "corners" | "varied" | "nominal">,
  unit: string,
): string {
  const r = w?.[key];
  return r ? `${v(r[0], unit)} … ${v(r[1], unit)}` : "—";
}

function studyVerdicts(study: SavedStudy | null | undefined): string[] {
  if (!study) return [];
  const out: string[] = [];
  const nm = study.noiseMargin?.summary;
  if (nm) {
    out.push(
      `Noise margin study: deadband ${v(nm.deadband, "V")}; chatter stays within ${pct(nm.limit)} up to ${nm.safeRms == null ? "no swept level" : v(nm.safeRms, "V") + " rms"}` +
        (nm.safeRmsConfident != null ? ` (${v(nm.safeRmsConfident, "V")} rms on the 95 % upper bound)` : "") +
        `; rule of thumb deadband/6.6 = ${v(nm.ruleOfThumbRms, "V")} rms.` +
        (nm.measuredVerdict
          ? ` Measured noise: ${nm.measuredVerdict === "inside" ? "inside the safe range" : nm.measuredVerdict === "outside" ? "OUTSIDE the safe range" : "beyond the swept levels"}.`
          : ""),
    );
  }
  const ts = study.toleranceSpread?.summary;
  if (ts) {
    out.push(
      `Tolerance spread: ${ts.draws.toLocaleString("en")} draws${ts.failed ? ` (${ts.failed} failed)` : ""}` +
        (ts.insideShare != null
          ? `; ${pct(ts.insideShare)} inside every window${ts.insideLow != null && ts.insideHigh != null ? ` (95 %: ${pct(ts.insideLow)} … ${pct(ts.insideHigh)})` : ""}.`
          : "; no windows set."),
    );
  }
  return out;
}

export function ReportView({ runId }: { runId: string }) {
  const runState = useRun(runId);
  const run = runState.data;
  const scenarioRow = useScenario(run?.scenarioId || null).data;
  const signoffState = useSignoffList(runId);
  const commentState = useComments(runId);
  const requestState = useReviewRequests(runId);
  const signoffs = signoffState.data;
  const comments = commentState.data;
  const requests = requestState.data;
  const links = useRunLinks(runId).data; // 403 for reviewers/viewers: the section then lists the team address only

  const derived = useMemo(() => {
    if (!run) return null;
    const { scenario, result } = run;
    const input = Float64Array.from(result.samples.input);
    const output = Float64Array.from(result.samples.output);
    const [inputMin, inputMax] = minMax(input);
    const switching = KIND_INFO[scenario.stage.kind].switching;
    const gain = switching ? null : measuredGain(input, output, result.rails);
    // The same worst case as the summary, the design panel and the tolerance spread study:
    // every part of the circuit as built, the supply and NTC tolerances (lib/design/spread).
    let wc: CircuitWorstCase | null = null;
    try {
      wc = circuitWorstCase(scenario);
    } catch {
      wc = null;
    }
    let bom: ReturnType<typeof billOfMaterials> | null = null;
    try {
      bom = billOfMaterials(scenario);
    } catch {
      bom = null;
    }
    const marks = designedMarks(scenario);
    const trace: PlotSpec = {
      xUnit: "s",
      yUnit: "V",
      series: [
        { x: result.samples.t, y: result.samples.input, color: PLOT_COLORS.input, width: 1.3, label: "input" },
        { x: result.samples.t, y: result.samples.output, color: PLOT_COLORS.output, width: 1.8, label: "output" },
      ],
      marks: [
        { y: result.rails.high, color: PLOT_COLORS.rail, label: "Voh" },
        { y: result.rails.low, color: PLOT_COLORS.rail, label: "Vol" },
        ...(marks?.upper != null ? [{ y: marks.upper, color: PLOT_COLORS.threshold, label: "upper, designed" }] : []),
        ...(marks?.lower != null && marks.lower !== marks.upper
          ? [{ y: marks.lower, color: PLOT_COLORS.threshold, label: "lower, designed" }]
          : []),
      ],
    };
    const loop: PlotSpec = {
      xUnit: "V",
      yUnit: "V",
      series: [
        {
          x: result.samples.input,
          y: result.samples.output,
          color: PLOT_COLORS.output,
          width: 1.6,
          label: "output against input",
        },
      ],
    };
    return {
      designed: designedFigures(scenario),
      checks: buildChecks(scenario, result.metrics, gain),
      warnings: buildWarnings({ scenario, metrics: result.metrics, rails: result.rails, inputMin, inputMax }),
      gain,
      wc,
      bom,
      trace,
      loop,
    };
  }, [run]);

  if (runState.error) return <NotFoundNote error={runState.error} />;
  if (!run || !derived) return <LoadingRows rows={10} />;
  const { scenario, result } = run;
  const m = result.metrics;
  const name = scenarioRow?.name ?? scenario.name ?? "Scenario";
  const title = run.label || `Run of ${name}`;
  const outOfDate =
    run.scenarioVersion != null && scenarioRow?.version != null && scenarioRow.version > run.scenarioVersion;
  const origin = typeof window === "undefined" ? "" : window.location.origin;
  const spec = scenario.spec as
    | { target?: { upperThreshold?: number; lowerThreshold?: number; gain?: number }; sensor?: unknown }
    | undefined;
  const specUnit = spec?.sensor ? (scenario.source?.unit ?? "V") : "V";
  const switching = KIND_INFO[scenario.stage.kind].switching;
  const caution = suggestsLoadSwitching(name, run.label, scenario.source?.quantity);
  const verdicts = studyVerdicts(run.study as SavedStudy | null);
  // Until the review lists arrive the report must not say "No standing decision": it says it is
  // still loading, and Print waits, so a printed report never leaves out a sign-off.
  const reviewLoaded = [signoffState, requestState, commentState].every((x) => x.data !== undefined || x.error);
  const pending = (x: { data?: unknown; error?: unknown }) => (
    <p className="text-[12px] text-ink-mute">{x.error ? `Could not load: ${errorMessage(x.error)}` : "Loading…"}</p>
  );
  const standing = signoffs?.items ?? [];
  const withdrawn = signoffs?.withdrawn ?? [];

  // With a source (divider, NTC, linear sensor) the spec is in the source's units: the source
  // column pairs it with the measured value there; the stage columns stay at the stage input.
  const src = m.source ?? null;
  const at = scenario.source?.quantity ? scenario.source.quantity : "source";
  const specAtSource = !!spec?.sensor;
  const srcCol = (x: number | null | undefined) => (src ? [v(x, src.unit)] : []);
  const specCell = (x: number | null | undefined, unit: string) => (x != null ? v(x, unit) : "—");
  const t = spec?.target;
  const specRows: ReactNode[][] = switching
    ? [
        [
          "Upper switching point",
          specCell(t?.upperThreshold, specUnit),
          ...srcCol(src?.upperThreshold),
          v(derived.designed.upperThreshold, "V"),
          range(derived.wc, "upperThreshold", "V"),
          v(m.upperThreshold, "V"),
        ],
        [
          "Lower switching point",
          specCell(t?.lowerThreshold, specUnit),
          ...srcCol(src?.lowerThreshold),
          v(derived.designed.lowerThreshold, "V"),
          range(derived.wc, "lowerThreshold", "V"),
          v(m.lowerThreshold, "V"),
        ],
        [
          "Deadband",
          t?.upperThreshold != null && t?.lowerThreshold != null
            ? v(t.upperThreshold - t.lowerThreshold, specUnit)
            : "—",
          ...srcCol(src?.hysteresis),
          derived.designed.upperThreshold != null && derived.designed.lowerThreshold != null
            ? v(derived.designed.upperThreshold - derived.designed.lowerThreshold, "V")
            : "—",
          range(derived.wc, "hysteresis", "V"),
          v(m.hysteresis, "V"),
        ],
        ...(derived.designed.period != null || m.period != null
          ? [
              [
                "Period",
                "—",
                ...(src ? ["—"] : []),
                v(derived.designed.period, "s"),
                "—",
                v(m.period, "s"),
              ] as ReactNode[],
            ]
          : []),
      ]
    : [
        [
          "Gain",
          t?.gain != null ? `${t.gain} V/V` : "—",
          ...(src ? ["—"] : []),
          derived.designed.gain != null ? `${Number(derived.designed.gain.toPrecision(4))} V/V` : "—",
          range(derived.wc, "gain", "V/V"),
          derived.gain != null ? `${Number(derived.gain.toPrecision(4))} V/V` : "—",
        ],
      ];
  const specHead = src
    ? [
        "Figure",
        specAtSource ? `Spec, ${at}` : "Spec",
        `Measured, ${at}`,
        "Designed, input",
        "Worst case, input",
        "Measured, input",
      ]
    : ["Figure", "Spec", "Designed", "Worst case", "Measured"];

  return (
    <div
      className="report-page mx-auto max-w-[820px] space-y-4 rounded-lg border border-paper-line bg-white p-6 text-ink shadow-sm"
      data-testid="review-report"
      data-review-loaded={reviewLoaded}
    >
      <style>{PRINT_CSS}</style>
      <div className="flex flex-wrap items-center justify-between gap-2" data-print-hide>
        <Link href={`/runs/${run.id}`} className="text-[13px] text-ink-mute hover:text-ink hover:underline">
          ← Back to the run
        </Link>
        <Button
          size="sm"
          variant="primary"
          onClick={() => window.print()}
          disabled={!reviewLoaded}
          title={reviewLoaded ? undefined : "Waiting for the sign-offs, review requests and comments"}
        >
          Print or save as PDF
        </Button>
      </div>

      <header className="report-section">
        <p className="text-[11px] font-semibold uppercase tracking-wider text-copper">
          Railwise · design review report
        </p>
        <h1 className="mt-0.5 text-xl font-semibold break-words" data-testid="report-title">
          {name}
        </h1>
        <p className="text-[13px] text-ink-soft break-words">
          Run “{title}” · {STAGE_KIND_LABEL[scenario.stage.kind]} · scenario version {run.scenarioVersion ?? "—"}
          {outOfDate ? ` (the scenario is now at version ${scenarioRow?.version})` : ""}
        </p>
        <p className="text-[12px] text-ink-mute">
          Saved {formatDate(run.createdAt)} by {personName(run.createdBy)} · re-run on the server ({result.solver.name})
          · report printed {formatDate(new Date().toISOString())}
        </p>
        <p className="mt-1 text-[12px] text-ink-mute break-all">
          Run: <span className="font-mono text-ink-soft">{`${origin}/runs/${run.id}`}</span>
        </p>
      </header>

      {caution && <SafetyCaution show className="report-section" />}

      <Section title="Review">
        <div className="grid gap-3 sm:grid-cols-2 print:grid-cols-2">
          <div>
            <h3 className="text-[12px] font-medium text-ink-soft">Sign-offs</h3>
            {signoffs === undefined ? (
              pending(signoffState)
            ) : standing.length === 0 ? (
              <p className="text-[12px] text-ink-mute">No standing decision.</p>
            ) : (
              <ul className="text-[12px]" aria-label="Report sign-offs">
                {standing.map((s) => (
                  <li key={s.id} className="py-0.5">
                    <span className="font-semibold">{DECISION_LABEL[s.decision]}</span> by {s.reviewer.name},{" "}
                    {formatDate(s.createdAt)}
                    {s.scenarioVersion ? `, for version ${s.scenarioVersion}` : ""}
                    {outOfDate && s.scenarioVersion != null && s.scenarioVersion < (scenarioRow?.version ?? 0) ? (
                      <span className="block font-semibold text-alert">
                        Out of date: the scenario is now at version {scenarioRow?.version}
                      </span>
                    ) : null}
                    {s.note && <span className="block whitespace-pre-wrap break-words text-ink-soft">{s.note}</span>}
                  </li>
                ))}
              </ul>
            )}
            {withdrawn.length > 0 && (
              <ul className="mt-1 text-[11px] text-ink-mute">
                {withdrawn.map((s) => (
                  <li key={s.id}>
                    {DECISION_LABEL[s.decision]} by {s.reviewer.name}, {formatDate(s.createdAt)} — withdrawn{" "}
                    {formatDate(s.withdrawnAt)}
                  </li>
                ))}
              </ul>
            )}
          </div>
          <div>
            <h3 className="text-[12px] font-medium text-ink-soft">Review requests</h3>
            {requests === undefined ? (
              pending(requestState)
            ) : requests.items.length === 0 ? (
              <p className="text-[12px] text-ink-mute">None.</p>
            ) : (
              <ul className="text-[12px]">
                {requests!.items.map((r) => (
                  <li key={r.id} className="py-0.5">
                    {r.reviewer.name} — asked by {r.requestedBy.name}, {formatDate(r.createdAt)};{" "}
                    {r.decision ? DECISION_LABEL[r.decision].toLowerCase() : "no decision yet"}
                  </li>
                ))}
              </ul>
            )}
            {links?.items && links.items.length > 0 && (
              <>
                <h3 className="mt-2 text-[12px] font-medium text-ink-soft">Run links</h3>
                <ul className="text-[12px]">
                  {links.items.map((l) => {
                    const x = l as typeof l & { label?: string | null; lastUsedAt?: string | null };
                    return (
                      <li key={l.id}>
                        {x.label || "(no label)"} · {l.state} · made {formatDate(l.createdAt)} ·{" "}
                        {x.lastUsedAt ? `last opened ${formatDate(x.lastUsedAt)}` : "never opened"}
                      </li>
                    );
                  })}
                </ul>
              </>
            )}
          </div>
        </div>
      </Section>

      <Section title="Stage">
        <div className="grid items-start gap-3 sm:grid-cols-[minmax(0,1.2fr)_minmax(0,1fr)] print:grid-cols-[minmax(0,1.2fr)_minmax(0,1fr)]">
          <StageDiagram scenario={scenario} className="w-full" />
          <SmallTable
            label="Supplies and part profile"
            head={["Condition", "Value"]}
            rows={[
              ["Supply", `${v(scenario.supply.positive, "V")} / ${v(scenario.supply.negative, "V")}`],
              ["Output limits (Voh / Vol)", `${v(result.rails.high, "V")} / ${v(result.rails.low, "V")}`],
              ["GBW", v(scenario.opamp.gainBandwidth, "Hz")],
              ["Slew rate", `${Number((scenario.opamp.slewRate / 1e6).toPrecision(3))} V/µs`],
              ["Input offset", v(scenario.opamp.inputOffset, "V")],
              ["Run", `${v(scenario.run.duration, "s")}, ${scenario.run.points.toLocaleString("en")} points`],
            ]}
          />
        </div>
      </Section>

      <Section title="Parts list">
        {derived.bom && derived.bom.lines.length > 0 ? (
          <SmallTable
            label="Parts list"
            head={["Ref · role", "Value", "Code", "Series", "Tol."]}
            rows={derived.bom.lines.map((l) => [
              <span key="r">
                <span className="font-mono font-medium">{l.ref}</span> <span className="text-ink-soft">{l.role}</span>
                {l.warning && <span className="block text-[11px] text-caution">{l.warning}</span>}
              </span>,
              l.kind === "capacitor" ? v(l.value, "F") : v(l.value, "Ω"),
              l.code,
              l.series ?? "none",
              pct(l.tolerance),
            ])}
          />
        ) : (
          <p className="text-[12px] text-ink-mute">No resistors or capacitors in this scenario.</p>
        )}
      </Section>

      <Section title="Spec, designed, worst case and measured">
        <SmallTable label="Spec against result" head={specHead} rows={specRows} />
        <p className="mt-1 text-[11px] text-ink-mute">
          {src ? `“${at}”: in the source's units (${src.unit}); “input”: volts at the stage input. ` : ""}Designed:
          closed forms with the chosen values. Worst case: every corner of resistor tolerance (
          {pct(scenario.tolerances?.resistor ?? 0.01)}), input offset and output headroom
          {derived.wc ? ` (${derived.wc.corners} corners)` : ""}. Measured: this run, re-simulated on the server.
        </p>
        {derived.checks.length > 0 && (
          <ul className="mt-2 text-[12px]" aria-label="Checks">
            {derived.checks.map((c) => (
              <li key={c.label}>
                <span
                  className={
                    c.pass === false ? "font-semibold text-alert" : c.pass ? "font-semibold text-moss" : "text-ink-mute"
                  }
                >
                  {c.pass === false ? "FAIL" : c.pass ? "pass" : "n/a"}
                </span>{" "}
                {c.label}: designed {v(c.designed, c.unit)}, measured {v(c.measured, c.unit)} (±{" "}
                {v(c.tolerance, c.unit)})
              </li>
            ))}
          </ul>
        )}
      </Section>

      <Section title="Studies">
        {verdicts.length === 0 ? (
          <p className="text-[12px] text-ink-mute">
            No noise margin study or tolerance spread was saved with this run.
          </p>
        ) : (
          <ul className="list-disc pl-4 text-[12px]">
            {verdicts.map((t) => (
              <li key={t}>{t}</li>
            ))}
          </ul>
        )}
      </Section>

      <Section title="Trace">
        <PlotImage
          spec={derived.trace}
          alt="Trace: input and output against time"
          width={760}
          height={260}
          testId="report-trace"
        />
      </Section>
      <Section title="Loop">
        <div className="mx-auto max-w-[520px]">
          <PlotImage
            spec={derived.loop}
            alt="Loop: output against input"
            width={520}
            height={300}
            testId="report-loop"
          />
        </div>
        <p className="mt-1 text-[12px] text-ink-soft">
          Measured:{" "}
          {switching
            ? `upper ${v(m.upperThreshold, "V")}, lower ${v(m.lowerThreshold, "V")}, deadband ${v(m.hysteresis, "V")}, ${m.transitions ?? 0} transitions, chatter ${m.chatter ?? 0}`
            : `gain ${derived.gain != null ? Number(derived.gain.toPrecision(4)) + " V/V" : "—"}`}
          ; clipped {pct(m.clippedFraction)} of the run.
        </p>
      </Section>

      <Section title="Warnings">
        {derived.warnings.length === 0 ? (
          <p className="text-[12px] text-ink-mute">None.</p>
        ) : (
          <ul className="text-[12px]" aria-label="Warnings">
            {derived.warnings.map((w) => (
              <li
                key={w.text}
                className={
                  w.level === "alert" ? "text-alert" : w.level === "caution" ? "text-caution" : "text-ink-soft"
                }
              >
                <span className="font-semibold uppercase">{w.level}</span> {w.text}
              </li>
            ))}
          </ul>
        )}
      </Section>

      <Section title="Comments">
        {comments === undefined ? (
          pending(commentState)
        ) : comments.items.length === 0 ? (
          <p className="text-[12px] text-ink-mute">No comments.</p>
        ) : (
          <ul className="flex flex-col gap-1.5 text-[12px]" aria-label="Report comments">
            {comments!.items.map((c) => (
              <li key={c.id}>
                <span className="font-medium">{c.author.name}</span>{" "}
                <span className="text-ink-mute">{formatDate(c.createdAt)}</span>
                <span className="block whitespace-pre-wrap break-words text-ink-soft">{c.body}</span>
              </li>
            ))}
          </ul>
        )}
      </Section>
      <p className="text-[11px] text-ink-faint">
        Behavioural simulation of op-amp stages; confirm on the bench before a board is built.
      </p>
    </div>
  );
}

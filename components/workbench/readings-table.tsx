// "Readings": every metric of a result with its unit, checks of measured against designed
// figures, and warnings in plain words. Shared by the live workbench and the stored run page.
import type { Scenario } from "@/lib/schemas/scenario";
import type { SimMetrics, SolverStats } from "@/lib/sim/types";
import { formatQuantity } from "@/lib/design/notation";
import { cx } from "@/components/ui/cx";
import { formatSource, sourceNumber, sourceRows, sourceSentence, sourceTerms } from "@/lib/workbench/source-readings";
import {
  isAmplifierKind,
  railsOf,
  type AmplifierReadings,
  type Check,
  type MetricsIn,
  type Rails,
  type Warning,
} from "@/lib/workbench/readings-logic";
import { contentKeys } from "@/lib/workbench/row-ids";

const fmt = (v: number | null | undefined, unit: string, digits = 4) =>
  v == null || !Number.isFinite(v) ? "—" : formatQuantity(v, unit, digits);

/**
 * An amplifier's readings: gain, output limits, clipped share and the input levels where
 * clipping starts. No switching rows: an amplifier does not switch (lib/schemas/README.md).
 */
export function amplifierRows(
  m: MetricsIn | SimMetrics,
  amp: AmplifierReadings,
  rails: Rails,
): [string, string, string?][] {
  return [
    [
      "Gain (linear region)",
      amp.gain == null ? "—" : `${amp.gain.toPrecision(5)} V/V`,
      "slope of output vs input while the output is clear of its limits",
    ],
    ["Output high limit (Voh)", fmt(rails.high, "V")],
    ["Output low limit (Vol)", fmt(rails.low, "V")],
    ["Held at a limit", `${(100 * m.clippedFraction).toFixed(2)} %`, "share of the run the output is clipped"],
    [
      "Clips high from input",
      amp.clipInputHigh == null ? "never reached" : fmt(amp.clipInputHigh, "V"),
      "input level at which the output first reaches Voh",
    ],
    [
      "Clips low from input",
      amp.clipInputLow == null ? "never reached" : fmt(amp.clipInputLow, "V"),
      "input level at which the output first reaches Vol",
    ],
    ["Fastest output slope", m.maxSlewRate > 0 ? `${(m.maxSlewRate / 1e6).toPrecision(3)} V/µs` : "0 V/µs"],
  ];
}

type Row = [string, string, string?, string?];

export function metricRows(
  m: MetricsIn | SimMetrics,
  gain: number | null,
  inputReferred = true,
  scenario?: Scenario,
): Row[] {
  // With a source the switching points read in its unit first, pin volts second.
  const terms = inputReferred && scenario && m.source ? sourceTerms(scenario) : null;
  // An oscillator has no input to refer switching points to; its capacitor node is internal.
  const thresholds: Row[] =
    terms && m.source
      ? sourceRows(m.source, m, terms).map(
          (r): Row => [
            r.label,
            r.value,
            r.label === "Deadband" ? "upper − lower" : `mean ${terms.quantity ?? "source"} at the edges`,
            r.pin,
          ],
        )
      : inputReferred
        ? [
            ["Upper switching point", fmt(m.upperThreshold, "V"), "mean input at edges the rising input causes"],
            ["Lower switching point", fmt(m.lowerThreshold, "V"), "mean input at edges the falling input causes"],
            ["Deadband", fmt(m.hysteresis, "V"), "upper − lower"],
          ]
        : [];
  return [
    ...thresholds,
    ["Output transitions", m.transitions == null ? "—" : String(m.transitions)],
    [
      "Chatter",
      m.chatter == null ? "—" : String(m.chatter),
      m.holdOff != null ? `edges within ${fmt(m.holdOff, "s", 3)} of the previous` : "edges within the hold-off",
    ],
    ["Held at a limit", `${(100 * m.clippedFraction).toFixed(2)} %`, "share of the run"],
    ["Fastest output slope", m.maxSlewRate > 0 ? `${(m.maxSlewRate / 1e6).toPrecision(3)} V/µs` : "0 V/µs"],
    ["Period", fmt(m.period, "s")],
    ["Frequency", m.period ? fmt(1 / m.period, "Hz") : "—"],
    ["Duty cycle", m.dutyCycle == null ? "—" : `${(100 * m.dutyCycle).toFixed(2)} %`],
    ["Propagation delay", fmt(m.propagationDelay, "s")],
    ["Rise time 10–90 %", fmt(m.riseTime, "s")],
    ["Fall time 90–10 %", fmt(m.fallTime, "s")],
    [
      "Gain (linear region)",
      gain == null ? "—" : `${gain.toPrecision(5)} V/V`,
      "slope of output vs input away from the limits",
    ],
  ];
}

export function ReadingsTable({
  metrics,
  checks,
  warnings,
  gain,
  solver,
  scenario,
  rails,
  amplifier,
}: {
  metrics: MetricsIn | SimMetrics;
  checks: Check[];
  warnings: Warning[];
  gain: number | null;
  solver?: SolverStats;
  scenario?: Scenario;
  /** Output limits of the run (from the part profile when absent). */
  rails?: Rails;
  /** An amplifier's readings when the caller measured them (else the core's, else gain only). */
  amplifier?: AmplifierReadings;
}) {
  const amp = scenario && isAmplifierKind(scenario.stage.kind);
  const warningKeys = contentKeys(warnings, (w) => w.text);
  const rows: Row[] = amp
    ? amplifierRows(
        metrics,
        amplifier ?? (metrics as MetricsIn).amplifier ?? { gain, clipInputHigh: null, clipInputLow: null },
        rails ?? railsOf(scenario),
      )
    : metricRows(metrics, gain, scenario?.stage.kind !== "relaxation-oscillator", scenario);
  const terms =
    !amp && scenario && metrics.source && scenario.stage.kind !== "relaxation-oscillator"
      ? sourceTerms(scenario)
      : null;
  const sentence = terms && metrics.source ? sourceSentence(metrics.source, metrics, terms) : null;
  const checkSource = checks.find((c) => c.source)?.source ?? null;
  return (
    <div className="text-[13px]" data-testid="readings">
      {sentence ? (
        <p
          className="mb-2 rounded border-l-[3px] border-indigo bg-paper-sunk/60 px-2 py-1 text-[12.5px] leading-snug text-ink"
          data-testid="source-sentence"
        >
          {sentence}
        </p>
      ) : null}
      {checks.length ? (
        <table className="mb-3 w-full border-collapse" data-testid="checks">
          <caption className="mb-1 text-left text-[11.5px] font-semibold uppercase tracking-wider text-ink-mute">
            Checks against the design
            {checkSource ? (
              <span
                className="block text-[11px] font-normal normal-case tracking-normal"
                data-testid="checks-source-note"
              >{`in ${checkSource.quantity ?? "source"} ${checkSource.unit}, volts at the pin beneath`}</span>
            ) : null}
          </caption>
          <thead>
            <tr className="border-b border-paper-line text-left text-[11.5px] text-ink-mute">
              <th className="py-1 font-medium">figure</th>
              <th className="py-1 text-right font-medium">designed</th>
              <th className="py-1 text-right font-medium">measured</th>
              <th className="py-1 pl-2 text-right font-medium">result</th>
            </tr>
          </thead>
          <tbody>
            {checks.map((c) => (
              <tr key={c.label} className="border-b border-paper-line/70 last:border-0" data-check={c.label}>
                <td className="py-1 pr-2 leading-tight text-ink-soft">
                  {c.label.replace(" switching point", " point")}
                </td>
                <td className="whitespace-nowrap py-1 pl-2 text-right font-mono">
                  {c.unit === "edges" ? (
                    `≤ ${c.designed}`
                  ) : c.source ? (
                    <SourceCell value={c.source.designed} pin={c.designed} src={c.source} />
                  ) : (
                    fmt(c.designed, c.unit)
                  )}
                </td>
                <td className="whitespace-nowrap py-1 pl-3 text-right font-mono">
                  {c.unit === "edges" ? (
                    c.measured == null ? (
                      "—"
                    ) : (
                      String(c.measured)
                    )
                  ) : c.source ? (
                    <SourceCell value={c.source.measured} pin={c.measured} src={c.source} />
                  ) : (
                    fmt(c.measured, c.unit)
                  )}
                </td>
                <td className="py-1 pl-2 text-right">
                  <span
                    title={
                      c.unit === "edges"
                        ? `at most ${c.designed} extra edges`
                        : `allowed ± ${fmt(c.tolerance, c.unit, 2)}`
                    }
                    className={cx(
                      "inline-block min-w-12 rounded px-1.5 text-center text-[11px] font-semibold",
                      c.pass === true && "bg-moss-soft text-moss",
                      c.pass === false && "bg-alert-soft text-alert",
                      c.pass === null && "bg-paper-sunk text-ink-mute",
                    )}
                  >
                    {c.pass === null ? "no edge" : c.pass ? "pass" : "fail"}
                  </span>
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      ) : null}

      {warnings.length ? (
        <ul className="mb-3 space-y-1.5" data-testid="warnings">
          {warnings.map((w, i) => (
            <li
              key={warningKeys[i]}
              className={cx(
                "rounded border-l-[3px] px-2 py-1 text-[12.5px] leading-snug",
                w.level === "alert" && "border-alert bg-alert-soft/60 text-ink",
                w.level === "caution" && "border-caution bg-caution-soft/70 text-ink",
                w.level === "note" && "border-ink-faint bg-paper-sunk/60 text-ink-soft",
              )}
            >
              {w.text}
            </li>
          ))}
        </ul>
      ) : (
        <p className="mb-3 rounded border-l-[3px] border-moss bg-moss-soft/60 px-2 py-1 text-[12.5px]">
          {amp
            ? "No warnings: no clipping, slew limiting or out-of-span input seen."
            : "No warnings: no clipping, chatter, slew limiting or out-of-span input seen."}
        </p>
      )}

      <table className="w-full border-collapse" data-testid="metrics">
        <caption className="mb-1 text-left text-[11.5px] font-semibold uppercase tracking-wider text-ink-mute">
          Measured
          {terms && metrics.source ? (
            <span
              className="block text-[11px] font-normal normal-case tracking-normal"
              data-testid="metrics-source-note"
            >{`switching points in ${terms.quantity ?? "source"} ${metrics.source.unit}, volts at the pin beneath`}</span>
          ) : null}
        </caption>
        <tbody>
          {rows.map(([k, v, hint, pin]) => (
            <tr key={k} className="border-b border-paper-line/60 last:border-0" data-metric={k}>
              <td className="py-[3px] pr-2 text-ink-soft" title={hint}>
                {k}
              </td>
              <td className="py-[3px] text-right font-mono text-ink">
                {v}
                {pin ? (
                  <span className="block text-[11px] text-ink-mute" data-pin>
                    {pin}
                  </span>
                ) : null}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
      {solver ? (
        <p className="mt-2 text-[11px] text-ink-faint">
          {solver.name} solver · {solver.steps.toLocaleString("en")} steps · {solver.wallMs.toFixed(0)} ms
          {scenario ? ` · ${scenario.run.points.toLocaleString("en")} samples` : ""}
        </p>
      ) : null}
    </div>
  );
}

/** A check's figure in the source unit, the pin volts beneath it. */
function SourceCell({
  value,
  pin,
  src,
}: {
  value: number | null;
  pin: number | null;
  src: NonNullable<Check["source"]>;
}) {
  return (
    <>
      <span data-source>{formatSource(value, src, true)}</span>
      <span className="block text-[11px] text-ink-mute" data-pin>
        {pin == null || !Number.isFinite(pin) ? "—" : `${sourceNumber(pin)} V pin`}
      </span>
    </>
  );
}

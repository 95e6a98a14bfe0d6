"use client";
// Read-only parts of the studies, shared by the Workbench and the run / shared-link pages:
// the answer in words, the chart, and a compact table of numbers.
import { formatQuantity } from "@/lib/design/notation";
import type { NoiseMarginSummary } from "@/lib/studies/noise-margin";
import type { ToleranceSpreadSummary, MeasureSpread } from "@/lib/studies/tolerance-spread";
import { ChatterPlot, SpreadHistogram, STUDY_COLORS } from "./study-plots";
import { MEASURE_LABEL, MEASURE_UNIT } from "@/lib/workbench/study-suggest";

export const fmtV = (v: number | null | undefined, digits = 3) =>
  v === null || v === undefined ? "—" : formatQuantity(v, "V", digits);
export const fmtPct = (p: number | null | undefined, digits = 1) =>
  p === null || p === undefined ? "—" : `${(p * 100).toFixed(digits)} %`;
const fmtFigure = (m: MeasureSpread["measure"], v: number | null | undefined) =>
  v === null || v === undefined ? "—" : MEASURE_UNIT[m] ? formatQuantity(v, MEASURE_UNIT[m], 4) : v.toPrecision(5);

function Key({ color, label, dashed }: { color: string; label: string; dashed?: boolean }) {
  return (
    <span className="inline-flex items-center gap-1.5 whitespace-nowrap text-[11.5px] text-ink-soft">
      <svg width="16" height="8" aria-hidden>
        <line
          x1="0"
          y1="4"
          x2="16"
          y2="4"
          stroke={color}
          strokeWidth="2"
          strokeDasharray={dashed ? "4 3" : undefined}
        />
      </svg>
      {label}
    </span>
  );
}

export function NoiseMarginResult({ summary, meta }: { summary: NoiseMarginSummary; meta?: string }) {
  const limitText = fmtPct(summary.limit, summary.limit < 0.01 ? 1 : 0);
  const failed = summary.levels.reduce((a, l) => a + l.failed, 0);
  const verdict =
    summary.safeRms === null
      ? `Chatter exceeds ${limitText} already at the lowest level swept (${fmtV(summary.levels[0]?.rms)} rms): sweep lower, or widen the deadband.`
      : summary.safeRms === summary.levels[summary.levels.length - 1].rms
        ? `Chatter stays at or under ${limitText} over the whole sweep, up to ${fmtV(summary.safeRms)} rms: sweep higher to find the edge.`
        : `Chatter stays at or under ${limitText} up to ${fmtV(summary.safeRms)} rms of noise.`;
  return (
    <div className="grid min-w-0 gap-2" data-testid="noise-margin-result">
      <p className="text-[13.5px] text-ink" data-testid="noise-verdict">
        <strong className="font-semibold">{verdict}</strong>{" "}
        {summary.deadband > 0 ? (
          <span className="text-ink-soft">
            Deadband {fmtV(summary.deadband)}; the 6.6 × rms rule of thumb allows {fmtV(summary.ruleOfThumbRms)} rms.
          </span>
        ) : (
          <span className="text-ink-soft">
            This stage has no deadband: any noise that reaches the threshold can chatter.
          </span>
        )}
      </p>
      {summary.measured ? (
        <p
          className={`rounded border-l-[3px] px-2 py-1 text-[13px] ${summary.measuredVerdict === "inside" ? "border-moss bg-moss-soft/60" : "border-caution bg-caution-soft/60"}`}
          data-testid="measured-verdict"
        >
          {summary.measured.label ?? "Measured noise"}: {fmtV(summary.measured.rms)} rms at{" "}
          {formatQuantity(summary.measured.bandwidth, "Hz", 3)} —{" "}
          {summary.measuredVerdict === "inside"
            ? `inside the margin (chatter ≤ ${limitText} at the next level swept).`
            : summary.measuredVerdict === "outside"
              ? `outside the margin: chatter above ${limitText} at that level.`
              : "beyond the sweep: extend the range to judge it."}
        </p>
      ) : null}
      <div className="flex flex-wrap gap-x-3 gap-y-0.5">
        <Key color={STUDY_COLORS.estimate} label="chatter probability (95 % Wilson band)" />
        <Key color={STUDY_COLORS.limit} label={`limit ${limitText}`} dashed />
        <Key color={STUDY_COLORS.safe} label="largest rms under the limit" />
        {summary.deadband > 0 ? <Key color={STUDY_COLORS.rule} label="deadband / 6.6" dashed /> : null}
        {summary.measured ? <Key color={STUDY_COLORS.measured} label="measured noise" dashed /> : null}
      </div>
      <ChatterPlot summary={summary} />
      <p className="text-[11.5px] text-ink-mute">
        A seed chatters when its run makes more output transitions than the noise-free run (
        {summary.referenceTransitions}). Per level: share of seeds that chattered, with its 95 % Wilson interval
        {summary.safeRmsConfident !== null
          ? `; the interval's upper end stays under the limit up to ${fmtV(summary.safeRmsConfident)} rms`
          : ""}
        .{failed ? ` ${failed} run(s) the solver gave up on are left out of their level.` : ""}
        {meta ? ` ${meta}` : ""}
      </p>
    </div>
  );
}

export function ToleranceSpreadResult({ summary, meta }: { summary: ToleranceSpreadSummary; meta?: string }) {
  return (
    <div className="grid min-w-0 gap-2" data-testid="tolerance-result">
      {summary.insideShare !== null ? (
        <p className="text-[13.5px] text-ink" data-testid="tolerance-verdict">
          <strong className="font-semibold">
            {fmtPct(summary.insideShare)} of {summary.draws.toLocaleString("en")} draws inside the spec window
          </strong>{" "}
          <span className="text-ink-soft">
            (95 % interval {fmtPct(summary.insideLow)} – {fmtPct(summary.insideHigh)}).
          </span>
        </p>
      ) : (
        <p className="text-[13.5px] text-ink-soft">Set a spec window to count the share of draws inside it.</p>
      )}
      <div className="flex flex-wrap gap-x-3 gap-y-0.5">
        <Key color={STUDY_COLORS.barsLine} label="draws (simulated)" />
        <Key color={STUDY_COLORS.corner} label="worst-case corners (closed form)" dashed />
        <Key color={STUDY_COLORS.nominal} label="nominal" dashed />
        <span className="inline-flex items-center gap-1.5 text-[11.5px] text-ink-soft">
          <span
            className="inline-block h-2.5 w-4 rounded-sm"
            style={{ background: STUDY_COLORS.window, outline: "1px solid rgba(77,122,58,0.4)" }}
          />{" "}
          spec window
        </span>
      </div>
      {/* Two histograms side by side only where each keeps room for its readouts (the card is wide at 1536 px and up). */}
      <div className="grid min-w-0 gap-3 2xl:grid-cols-2">
        {summary.measures.map((m) => (
          <figure key={m.measure} className="min-w-0">
            <figcaption className="mb-0.5 flex flex-wrap items-baseline justify-between gap-x-3 text-[12.5px]">
              <span className="font-semibold text-ink-soft">{MEASURE_LABEL[m.measure]}</span>
              <span className="font-mono text-[11.5px] text-ink-mute">
                mean {fmtFigure(m.measure, m.summary.mean)} · σ {fmtFigure(m.measure, m.summary.std)}
                {m.window
                  ? ` · inside ${fmtPct(m.inside !== null ? m.inside / Math.max(1, summary.draws) : null)}`
                  : ""}
              </span>
            </figcaption>
            <SpreadHistogram spread={m} />
            <table className="w-full font-mono text-[11.5px]">
              <tbody>
                <tr className="text-ink-mute">
                  <td className="pr-2 whitespace-nowrap">draws min … max</td>
                  <td className="text-right whitespace-nowrap text-ink">
                    {fmtFigure(m.measure, m.summary.min)} … {fmtFigure(m.measure, m.summary.max)}
                  </td>
                </tr>
                <tr className="text-ink-mute">
                  <td className="pr-2 whitespace-nowrap">worst case</td>
                  <td className="text-right whitespace-nowrap text-ink">
                    {m.worstCase
                      ? `${fmtFigure(m.measure, m.worstCase[0])} … ${fmtFigure(m.measure, m.worstCase[1])}`
                      : "—"}
                  </td>
                </tr>
                {m.window ? (
                  <tr className="text-ink-mute">
                    <td className="pr-2 whitespace-nowrap">spec window</td>
                    <td className="text-right whitespace-nowrap text-ink">
                      {fmtFigure(m.measure, m.window[0])} … {fmtFigure(m.measure, m.window[1])}
                    </td>
                  </tr>
                ) : null}
                {m.missing ? (
                  <tr className="text-caution">
                    <td className="pr-2 whitespace-nowrap">not measured</td>
                    <td className="text-right whitespace-nowrap">{m.missing} draws</td>
                  </tr>
                ) : null}
              </tbody>
            </table>
          </figure>
        ))}
      </div>
      <p className="text-[11.5px] text-ink-mute">
        Each draw is a full simulation of the perturbed stage; the corners come from the closed-form figures over every
        tolerance extreme.
        {summary.failed ? ` ${summary.failed} draw(s) the solver gave up on count as not measured.` : ""}
        {meta ? ` ${meta}` : ""}
      </p>
    </div>
  );
}

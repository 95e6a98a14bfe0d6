"use client";
// The two study charts (uPlot): chatter probability against noise rms with its Wilson band and
// the markers that answer "is my deadband wide enough?"; and a histogram of one figure across
// the tolerance draws with lib/design's worst-case corners and the spec window on the same axis.
import { useRef } from "react";
import uPlot from "uplot";
import { useUPlot, siTicks, axis, hLine, vLine, PLOT_COLORS } from "@/components/plots/use-uplot";
import { exportPlotPng } from "@/components/plots/export";
import type { NoiseMarginSummary } from "@/lib/studies/noise-margin";
import type { MeasureSpread } from "@/lib/studies/tolerance-spread";
import { MEASURE_LABEL, MEASURE_UNIT } from "@/lib/workbench/study-suggest";

export const STUDY_COLORS = {
  estimate: PLOT_COLORS.output, // copper
  band: "rgba(181, 86, 42, 0.16)",
  limit: "#b4232f", // alert
  safe: PLOT_COLORS.threshold, // moss
  rule: PLOT_COLORS.input, // indigo
  measured: "#a86b00", // caution
  bars: "rgba(59, 79, 168, 0.55)",
  barsLine: PLOT_COLORS.input,
  window: "rgba(77, 122, 58, 0.12)",
  corner: "#b4232f",
  nominal: "#1d2430",
};

const TAG_FONT = (dpr: number) => `${10 * dpr}px var(--font-jb), ui-monospace, monospace`;

/**
 * Where the label of the vertical line at `x` goes: on `side` of the line (by default right of
 * it, left near the right edge), flipped when it would leave the plotting area. Null off the plot.
 */
function placeTag(u: uPlot, x: number, text: string, side?: "left" | "right") {
  const px = u.valToPos(x, "x", true);
  if (px < u.bbox.left || px > u.bbox.left + u.bbox.width) return null;
  const dpr = devicePixelRatio;
  u.ctx.save();
  u.ctx.font = TAG_FONT(dpr);
  const w = u.ctx.measureText(text).width + 4 * dpr;
  u.ctx.restore();
  let right = side ? side === "left" : px > u.bbox.left + u.bbox.width * 0.7;
  // A tag asked to sit left of its line may reach a little into the y-axis gutter (between tick
  // labels) before it flips: flipped, it would print across the line it was turned away from.
  const slack = side ? 24 * dpr : 0;
  if (right && px - w < u.bbox.left - slack) right = false;
  else if (!right && px + w > u.bbox.left + u.bbox.width) right = true;
  const at = px + (right ? -4 : 4) * dpr;
  return { at, right, span: (right ? [at - w, at] : [at, at + w]) as [number, number] };
}

/** Draws the label; answers the span of canvas x it covers (null when off the plot). */
function tag(
  u: uPlot,
  x: number,
  text: string,
  color: string,
  row: number,
  side?: "left" | "right",
): [number, number] | null {
  const place = placeTag(u, x, text, side);
  if (!place) return null;
  const ctx = u.ctx;
  const dpr = devicePixelRatio;
  ctx.save();
  ctx.font = TAG_FONT(dpr);
  ctx.fillStyle = color;
  ctx.textAlign = place.right ? "right" : "left";
  ctx.textBaseline = "top";
  ctx.fillText(text, place.at, u.bbox.top + (4 + row * 13) * dpr);
  ctx.restore();
  return place.span;
}

export function ChatterPlot({
  summary,
  height = 240,
  fileName = "noise-margin.png",
}: {
  summary: NoiseMarginSummary;
  height?: number;
  fileName?: string;
}) {
  const ref = useRef<HTMLDivElement>(null);
  const plot = useUPlot(
    ref,
    (width) => {
      const x = Float64Array.from(summary.levels, (l) => l.rms);
      const p = Float64Array.from(summary.levels, (l) => l.probability);
      const lo = Float64Array.from(summary.levels, (l) => l.low);
      const hi = Float64Array.from(summary.levels, (l) => l.high);
      const xMax = Math.max(x[x.length - 1], summary.ruleOfThumbRms, summary.measured?.rms ?? 0) * 1.04;
      const opts: uPlot.Options = {
        width,
        height,
        legend: { show: false },
        cursor: { drag: { x: false, y: false } },
        scales: { x: { time: false, range: [0, xMax] }, y: { range: [0, 1] } },
        axes: [
          axis({ values: siTicks("V"), label: "noise rms", labelSize: 18, size: 34 }),
          axis({
            values: (_u, s) => s.map((v) => `${Math.round(v * 100)} %`),
            size: 48,
            label: "chatter probability",
            labelSize: 18,
          }),
        ],
        series: [
          {},
          {
            label: "estimate",
            stroke: STUDY_COLORS.estimate,
            width: 2,
            points: { show: true, size: 5, fill: STUDY_COLORS.estimate },
          },
          { label: "95 % low", stroke: "rgba(181,86,42,0.35)", width: 1 },
          { label: "95 % high", stroke: "rgba(181,86,42,0.35)", width: 1 },
        ],
        bands: [{ series: [3, 2], fill: STUDY_COLORS.band }],
        hooks: {
          draw: [
            (u) => {
              hLine(u, summary.limit, STUDY_COLORS.limit, [5, 4]);
              let row = 0;
              // The rule-of-thumb and the largest-safe-rms lines are often close: their tags point
              // away from each other so neither prints across the other's line.
              const both = summary.deadband > 0 && summary.safeRms !== null;
              const safeLeft = both && summary.safeRms! < summary.ruleOfThumbRms;
              if (summary.deadband > 0) {
                vLine(u, summary.ruleOfThumbRms, STUDY_COLORS.rule, [4, 3]);
                tag(
                  u,
                  summary.ruleOfThumbRms,
                  "deadband / 6.6",
                  STUDY_COLORS.rule,
                  row++,
                  both ? (safeLeft ? "right" : "left") : undefined,
                );
              }
              if (summary.safeRms !== null) {
                vLine(u, summary.safeRms, STUDY_COLORS.safe, []);
                tag(
                  u,
                  summary.safeRms,
                  `≤ ${(summary.limit * 100).toFixed(summary.limit < 0.01 ? 1 : 0)} % chatter`,
                  STUDY_COLORS.safe,
                  row++,
                  both ? (safeLeft ? "left" : "right") : undefined,
                );
              }
              if (summary.measured) {
                vLine(u, summary.measured.rms, STUDY_COLORS.measured, [2, 3]);
                tag(u, summary.measured.rms, summary.measured.label ?? "measured", STUDY_COLORS.measured, row++);
              }
            },
          ],
        },
      };
      return { opts, data: [x, p, lo, hi] as uPlot.AlignedData };
    },
    [summary, height],
  );
  return (
    <div className="min-w-0">
      <div ref={ref} className="min-w-0" data-testid="chatter-plot" />
      <PlotFoot
        onPng={() => plot.current && exportPlotPng(plot.current, "Noise margin study — chatter probability", fileName)}
      />
    </div>
  );
}

export function SpreadHistogram({
  spread,
  height = 190,
  fileName,
}: {
  spread: MeasureSpread;
  height?: number;
  fileName?: string;
}) {
  const ref = useRef<HTMLDivElement>(null);
  const plot = useUPlot(
    ref,
    (width) => {
      const { edges, counts } = spread.histogram;
      const x = Float64Array.from(counts, (_, i) => (edges[i] + edges[i + 1]) / 2);
      const y = Float64Array.from(counts);
      const maxCount = Math.max(1, ...counts);
      const unit = MEASURE_UNIT[spread.measure];
      const opts: uPlot.Options = {
        width,
        height,
        legend: { show: false },
        cursor: { drag: { x: false, y: false } },
        scales: { x: { time: false, range: [edges[0], edges[edges.length - 1]] }, y: { range: [0, maxCount * 1.12] } },
        axes: [
          axis({ values: siTicks(unit ?? ""), size: 30 }),
          axis({ size: 40, values: (_u, s) => s.map((v) => (Number.isInteger(v) ? String(v) : "")) }),
        ],
        series: [
          {},
          {
            label: "draws",
            stroke: STUDY_COLORS.barsLine,
            fill: STUDY_COLORS.bars,
            width: 1,
            paths: uPlot.paths.bars!({ size: [0.92, Infinity], align: 0 }),
            points: { show: false },
          },
        ],
        hooks: {
          drawClear: [
            (u) => {
              // The spec window as a shaded strip behind the bars.
              if (!spread.window) return;
              const a = Math.max(u.bbox.left, u.valToPos(spread.window[0], "x", true));
              const b = Math.min(u.bbox.left + u.bbox.width, u.valToPos(spread.window[1], "x", true));
              if (b <= a) return;
              u.ctx.save();
              u.ctx.fillStyle = STUDY_COLORS.window;
              u.ctx.fillRect(a, u.bbox.top, b - a, u.bbox.height);
              u.ctx.restore();
            },
          ],
          draw: [
            (u) => {
              let row = 0;
              if (spread.nominal !== null) {
                vLine(u, spread.nominal, STUDY_COLORS.nominal, [1, 2]);
                tag(u, spread.nominal, "nominal", STUDY_COLORS.nominal, row++);
              }
              if (spread.worstCase) {
                vLine(u, spread.worstCase[0], STUDY_COLORS.corner, [5, 3]);
                vLine(u, spread.worstCase[1], STUDY_COLORS.corner, [5, 3]);
                // Labels point away from each other so close corners stay readable.
                const a = tag(u, spread.worstCase[0], "worst case", STUDY_COLORS.corner, row, "left");
                // Both labels flipped inwards (corners near the plot's edges) and meeting: the
                // second one goes a row lower.
                const b = placeTag(u, spread.worstCase[1], "worst case", "right")?.span;
                const clash = a && b && a[0] < b[1] && b[0] < a[1];
                tag(u, spread.worstCase[1], "worst case", STUDY_COLORS.corner, clash ? row + 1 : row, "right");
              }
            },
          ],
        },
      };
      return { opts, data: [x, y] as uPlot.AlignedData };
    },
    [spread, height],
  );
  return (
    <div className="min-w-0">
      <div ref={ref} className="min-w-0" data-testid={`histogram-${spread.measure}`} />
      <PlotFoot
        onPng={() =>
          plot.current &&
          exportPlotPng(
            plot.current,
            `Tolerance spread — ${MEASURE_LABEL[spread.measure]}`,
            fileName ?? `spread-${spread.measure}.png`,
          )
        }
      />
    </div>
  );
}

function PlotFoot({ onPng }: { onPng: () => void }) {
  return (
    <div className="flex justify-end">
      <button
        type="button"
        onClick={onPng}
        className="h-5 rounded border border-paper-line bg-white px-1.5 text-[11px] text-ink-mute hover:text-ink"
        title="Save this chart as a PNG image"
      >
        PNG
      </button>
    </div>
  );
}

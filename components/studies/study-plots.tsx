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
/** One tag row in the strip above the plotting area, CSS px. */
const TAG_ROW = 13;

/**
 * Room above the plotting area for `rows` line tags (CSS px, as uPlot's top padding). The tags
 * live there, outside the plotting area, so they can never print across the curve, the bars or
 * one another, wherever the data puts its lines.
 */
function tagStrip(rows: number): number {
  return rows > 0 ? 6 + rows * TAG_ROW : 10;
}

interface LineTag {
  x: number;
  text: string;
  color: string;
}

/**
 * Draws each tag in its own row of the strip above the plot, starting at its line's x and running
 * right, or ending there when it would pass the plot's right edge; a short tick from the plot's
 * top edge up to the row ties the words to their line. Rows are ordered so that no tick runs
 * through another tag's words where that can be avoided (at most three tags: every order is
 * tried). The boxes drawn (CSS px, relative to the plot) are kept on the chart's root as
 * data-tag-boxes, with the plotting area, so a browser test can check that no tag reaches into
 * the plot.
 */
function tagsAbove(u: uPlot, tags: LineTag[]): void {
  const ctx = u.ctx;
  const dpr = devicePixelRatio;
  const { left, top, width } = u.bbox;
  ctx.save();
  ctx.font = TAG_FONT(dpr);
  const placed = tags.flatMap((t) => {
    const px = u.valToPos(t.x, "x", true);
    if (!Number.isFinite(px) || px < left || px > left + width) return [];
    const w = ctx.measureText(t.text).width;
    const x0 = px + 3 * dpr + w <= left + width ? px + 3 * dpr : Math.max(left, px - 3 * dpr - w);
    return [{ ...t, px, x0, x1: x0 + w }];
  });
  // A tick of the tag in row r passes every row below r: count the words it would cross.
  const crossings = (order: typeof placed) =>
    order.reduce(
      (n, a, ra) => n + order.filter((b, rb) => rb > ra && b.x0 - 2 * dpr <= a.px && a.px <= b.x1 + 2 * dpr).length,
      0,
    );
  let best = placed;
  for (const order of permutations(placed)) if (crossings(order) < crossings(best)) best = order;
  const boxes: number[][] = [];
  best.forEach((t, row) => {
    const y0 = top - (tagStrip(tags.length) - 3 - row * TAG_ROW) * dpr;
    ctx.fillStyle = t.color;
    ctx.textAlign = "left";
    ctx.textBaseline = "top";
    ctx.fillText(t.text, t.x0, y0);
    ctx.strokeStyle = t.color;
    ctx.lineWidth = Math.max(1, dpr);
    ctx.beginPath();
    ctx.moveTo(Math.round(t.px) + 0.5, top);
    ctx.lineTo(Math.round(t.px) + 0.5, y0 + 11 * dpr);
    ctx.stroke();
    boxes.push([t.x0 / dpr, y0 / dpr, t.x1 / dpr, (y0 + 10 * dpr) / dpr]);
  });
  ctx.restore();
  u.root.dataset.tagBoxes = JSON.stringify({
    plot: [left / dpr, top / dpr, (left + width) / dpr, (top + u.bbox.height) / dpr],
    tags: boxes,
  });
}

function permutations<T>(items: T[]): T[][] {
  if (items.length <= 1) return [items];
  return items.flatMap((first, i) =>
    permutations([...items.slice(0, i), ...items.slice(i + 1)]).map((rest) => [first, ...rest]),
  );
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
      const rows = Number(summary.deadband > 0) + Number(summary.safeRms !== null) + Number(!!summary.measured);
      const strip = tagStrip(rows);
      const opts: uPlot.Options = {
        width,
        height: height + strip,
        padding: [strip, null, null, null],
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
              const tags: LineTag[] = [];
              if (summary.deadband > 0) {
                vLine(u, summary.ruleOfThumbRms, STUDY_COLORS.rule, [4, 3]);
                tags.push({ x: summary.ruleOfThumbRms, text: "deadband / 6.6", color: STUDY_COLORS.rule });
              }
              if (summary.safeRms !== null) {
                vLine(u, summary.safeRms, STUDY_COLORS.safe, []);
                tags.push({
                  x: summary.safeRms,
                  text: `≤ ${(summary.limit * 100).toFixed(summary.limit < 0.01 ? 1 : 0)} % chatter`,
                  color: STUDY_COLORS.safe,
                });
              }
              if (summary.measured) {
                vLine(u, summary.measured.rms, STUDY_COLORS.measured, [2, 3]);
                tags.push({
                  x: summary.measured.rms,
                  text: summary.measured.label ?? "measured",
                  color: STUDY_COLORS.measured,
                });
              }
              tagsAbove(u, tags);
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
      // Close corners share one tag: two would put a tick through the other's words (plot width
      // taken as the chart's less the y axis, near enough to choose).
      const span = edges[edges.length - 1] - edges[0];
      const cornersApart = spread.worstCase
        ? (Math.abs(spread.worstCase[1] - spread.worstCase[0]) / (span || 1)) * (width - 50)
        : 0;
      const oneCornerTag = cornersApart < 130;
      const strip = tagStrip(Number(spread.nominal !== null) + (spread.worstCase ? (oneCornerTag ? 1 : 2) : 0));
      const opts: uPlot.Options = {
        width,
        height: height + strip,
        padding: [strip, null, null, null],
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
              const tags: LineTag[] = [];
              if (spread.nominal !== null) {
                vLine(u, spread.nominal, STUDY_COLORS.nominal, [1, 2]);
                tags.push({ x: spread.nominal, text: "nominal", color: STUDY_COLORS.nominal });
              }
              if (spread.worstCase) {
                vLine(u, spread.worstCase[0], STUDY_COLORS.corner, [5, 3]);
                vLine(u, spread.worstCase[1], STUDY_COLORS.corner, [5, 3]);
                const [lo, hi] = spread.worstCase;
                if (oneCornerTag) tags.push({ x: lo, text: "worst case", color: STUDY_COLORS.corner });
                else {
                  tags.push({ x: lo, text: "worst case (low)", color: STUDY_COLORS.corner });
                  tags.push({ x: hi, text: "worst case (high)", color: STUDY_COLORS.corner });
                }
              }
              tagsAbove(u, tags);
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

"use client";
// "Trace": input (indigo) and output (copper) against time, with the output limits, the
// designed switching points and the measured output edges marked. Runs longer than
// DISPLAY_LIMIT samples are drawn through the shared min/max thinner (lib/plot/min-max.ts).
import { useEffect, useMemo, useRef, useState } from "react";
import type uPlot from "uplot";
import type { SimEvent } from "@/lib/sim/types";
import { PlotToolbar, Readout, cursorItems, type LegendItem } from "./plot-chrome";
import { MinMaxThinner, pickAt } from "@/lib/plot/min-max";
import { exportPlotPng } from "./export";
import { PLOT_COLORS, axis, hLine, siTicks, tagClear, tagRight, useUPlot, wheelPan } from "./use-uplot";

export interface TimePlotProps {
  t: Float64Array;
  input: Float64Array;
  output: Float64Array;
  rails: { high: number; low: number };
  thresholds?: { upper: number | null; lower: number | null } | null;
  events?: SimEvent[];
  cursorIdx: number | null;
  onCursor?: (idx: number | null) => void;
  onFirstDraw?: () => void;
  height?: number;
  fileName?: string;
  /** Timing-capacitor voltage (v−) of a relaxation oscillator, drawn as a third line. */
  capacitor?: Float64Array | null;
  /** Legend words for the threshold lines ("designed switching points" by default). */
  thresholdLabel?: string;
  /** Mark the measured output edges (off for amplifiers: they do not switch). */
  showEdges?: boolean;
  /** Title, scenario and run lines printed on an exported PNG. */
  exportTitle?: string[];
  /** The input in source units (samples.source), drawn on its own right-hand scale. */
  source?: { values: Float64Array; unit: string; label: string } | null;
  /** The filter node's voltage (samples.filtered), drawn in volts beside the stage input. */
  filtered?: Float64Array | null;
}

export function TimePlot(props: TimePlotProps) {
  const {
    t,
    input,
    output,
    rails,
    thresholds,
    cursorIdx,
    onCursor,
    onFirstDraw,
    height = 300,
    fileName = "trace.png",
    capacitor = null,
    showEdges = true,
    exportTitle,
    source = null,
    filtered = null,
  } = props;
  const events = useMemo(() => (showEdges ? (props.events ?? []) : []), [showEdges, props.events]);
  const thresholdLabel = props.thresholdLabel ?? "designed switching points";
  const box = useRef<HTMLDivElement>(null);
  const emitted = useRef<number | null>(null);
  const view = useDisplayColumns(t, input, output);
  // Extra columns follow the same display thinning as input and output.
  const capView = useMemo(() => thinned(capacitor, view, t.length), [capacitor, view, t.length]);
  const filteredView = useMemo(() => thinned(filtered, view, t.length), [filtered, view, t.length]);
  const sourceView = useMemo(() => thinned(source?.values ?? null, view, t.length), [source, view, t.length]);
  const sourceUnit = source?.unit ?? "";
  const cb = useRef({ onCursor, onFirstDraw });
  cb.current = { onCursor, onFirstDraw };

  const plot = useUPlot(
    box,
    (width) => {
      if (!view) return null;
      let first = true;
      let frame = 0;
      const opts: uPlot.Options = {
        width,
        height,
        legend: { show: false },
        scales: { x: { time: false } },
        cursor: { drag: { x: true, y: false, setScale: true }, points: { size: 7 } },
        series: [
          {},
          { label: "input", stroke: PLOT_COLORS.input, width: 1.4 },
          { label: "output", stroke: PLOT_COLORS.output, width: 1.8 },
          ...(capView ? [{ label: "capacitor", stroke: PLOT_COLORS.capacitor, width: 1.4 }] : []),
          ...(filteredView ? [{ label: "filtered", stroke: PLOT_COLORS.filtered, width: 1.4, dash: [5, 3] }] : []),
          ...(sourceView ? [{ label: "source", stroke: PLOT_COLORS.source, width: 1.2, scale: "src" }] : []),
        ],
        axes: [
          axis({ values: siTicks("s"), size: 34 }),
          axis({ values: siTicks("V"), size: 64, label: "volts", labelSize: 16 }),
          ...(sourceView
            ? [
                axis({
                  scale: "src",
                  side: 1,
                  grid: { show: false },
                  size: 64,
                  label: `${source?.label ?? "source"} (${sourceUnit})`,
                  labelSize: 16,
                  stroke: PLOT_COLORS.source,
                  values: (_u: uPlot, splits: number[]) => splits.map((v) => plainTick(v, splits)),
                }),
              ]
            : []),
        ],
        plugins: [wheelPan()],
        hooks: {
          drawAxes: [
            (u) => {
              hLine(u, rails.high, PLOT_COLORS.rail, [2, 3]);
              hLine(u, rails.low, PLOT_COLORS.rail, [2, 3]);
              tagRight(u, rails.high, "Voh", PLOT_COLORS.rail);
              tagRight(u, rails.low, "Vol", PLOT_COLORS.rail);
              if (thresholds?.upper != null) hLine(u, thresholds.upper, PLOT_COLORS.threshold, [7, 4]);
              if (thresholds?.lower != null && thresholds.lower !== thresholds.upper)
                hLine(u, thresholds.lower, PLOT_COLORS.threshold, [7, 4]);
            },
          ],
          draw: [
            (u) => {
              // Threshold tags over the series, at the end of the plot the curves leave clearer.
              if (thresholds?.upper != null)
                tagClear(u, thresholds.upper, capView ? "upper level" : "upper, designed", PLOT_COLORS.threshold);
              if (thresholds?.lower != null && thresholds.lower !== thresholds.upper)
                tagClear(
                  u,
                  thresholds.lower,
                  capView ? "lower level" : "lower, designed",
                  PLOT_COLORS.threshold,
                  "below",
                );
              drawEvents(u, events);
              if (first) {
                first = false;
                cb.current.onFirstDraw?.();
              }
            },
          ],
          setCursor: [
            (u) => {
              cancelAnimationFrame(frame);
              frame = requestAnimationFrame(() => {
                const vi = u.cursor.idx ?? null;
                const idx = vi == null ? null : view.index ? view.index[vi] : vi;
                if (idx === emitted.current) return;
                emitted.current = idx;
                cb.current.onCursor?.(idx);
              });
            },
          ],
        },
      };
      const cols = [
        view.t,
        view.input,
        view.output,
        ...(capView ? [capView] : []),
        ...(filteredView ? [filteredView] : []),
        ...(sourceView ? [sourceView] : []),
      ];
      return { opts, data: cols as unknown as uPlot.AlignedData };
    },
    [
      view,
      capView,
      filteredView,
      sourceView,
      sourceUnit,
      source?.label,
      rails.high,
      rails.low,
      thresholds?.upper,
      thresholds?.lower,
      events,
      height,
    ],
  );

  // A cursor set by the other plot moves ours (without echoing it back).
  useEffect(() => {
    const u = plot.current;
    if (!u || cursorIdx === emitted.current) return;
    emitted.current = cursorIdx;
    if (cursorIdx == null || cursorIdx >= t.length) {
      u.setCursor({ left: -10, top: -10 }, false);
      return;
    }
    u.setCursor({ left: u.valToPos(t[cursorIdx], "x"), top: u.valToPos(output[cursorIdx], "y") }, false);
  }, [cursorIdx, plot, t, output]);

  const reset = () => plot.current?.setScale("x", { min: t[0], max: t[t.length - 1] });
  const zoom = (f: number) => {
    const u = plot.current;
    if (!u) return;
    const min = u.scales.x.min!;
    const max = u.scales.x.max!;
    const mid = (min + max) / 2;
    u.setScale("x", { min: mid - (mid - min) * f, max: mid + (max - mid) * f });
  };
  const pan = (f: number) => {
    const u = plot.current;
    if (!u) return;
    const min = u.scales.x.min!;
    const max = u.scales.x.max!;
    const d = (max - min) * f;
    u.setScale("x", { min: min + d, max: max + d });
  };

  const i = cursorIdx != null && cursorIdx < t.length ? cursorIdx : null;
  const legend: LegendItem[] = [
    { color: PLOT_COLORS.input, label: sourceView ? "stage input (V)" : "input" },
    { color: PLOT_COLORS.output, label: "output" },
    ...(capView ? [{ color: PLOT_COLORS.capacitor, label: "capacitor (v−)" }] : []),
    ...(filteredView ? [{ color: PLOT_COLORS.filtered, label: "filter node (V)", dashed: true }] : []),
    ...(sourceView
      ? [{ color: PLOT_COLORS.source, label: `${source?.label ?? "source"} (${sourceUnit}, right scale)` }]
      : []),
    ...(thresholds && (thresholds.upper != null || thresholds.lower != null)
      ? [{ color: PLOT_COLORS.threshold, label: thresholdLabel, dashed: true }]
      : []),
    { color: PLOT_COLORS.rail, label: "output limits", dashed: true },
    ...(showEdges ? [{ color: PLOT_COLORS.event, label: "measured edges", tick: true }] : []),
  ];
  return (
    <div className="min-w-0" data-testid="trace-plot" data-series={legend.map((l) => l.label).join("|")}>
      <PlotToolbar
        legend={legend}
        onZoomIn={() => zoom(0.5)}
        onZoomOut={() => zoom(2)}
        onPanLeft={() => pan(-0.25)}
        onPanRight={() => pan(0.25)}
        onReset={reset}
        onPng={() =>
          plot.current &&
          exportPlotPng(
            plot.current,
            { title: "Trace — input and output against time", lines: exportTitle, legend, xUnit: "s", yUnit: "V" },
            fileName,
          )
        }
      />
      <div ref={box} className="min-w-0" />
      <Readout
        items={withSourceItem(cursorItems(t, input, output, i), source, i)}
        hint="drag to zoom · wheel to zoom · Shift+drag to pan"
      />
    </div>
  );
}

/** A column picked at the display indices (the full column when nothing is thinned). */
function thinned(col: Float64Array | null, view: Columns | null, n: number): Float64Array | null {
  if (!col || !view || col.length !== n) return null;
  if (!view.index) return col;
  return pickAt(col, view.index);
}

/** Source-axis tick: plain decimals, as many as the tick spacing needs (no SI prefix on °C). */
function plainTick(v: number, splits: number[]): string {
  const step = splits.length > 1 ? Math.abs(splits[1] - splits[0]) : Math.abs(v) || 1;
  const decimals = Math.max(0, Math.min(6, -Math.floor(Math.log10(step) + 1e-9)));
  return v.toFixed(decimals);
}

/** The cursor readout gains the source value when the run has one. */
function withSourceItem(
  items: [string, number, string][] | null,
  source: TimePlotProps["source"],
  i: number | null,
): [string, number, string][] | null {
  if (!items || !source || i == null || i >= source.values.length) return items;
  return [...items.slice(0, 2), [source.label, source.values[i], source.unit], ...items.slice(2)];
}

/** Above this many samples the Trace gets a min/max view (see displayColumns). */
const DISPLAY_LIMIT = 40_000;
const BUCKETS = 4096;

type Columns = { t: Float64Array; input: Float64Array; output: Float64Array; index: Int32Array | null };

/**
 * Display-only thinning for very long runs: per time bucket keep the samples where the input and
 * the output reach their minimum and maximum (in time order), so every spike, edge and clip stays
 * visible while uPlot draws ≤ 16k points instead of a million (its own per-pixel pass over 10⁶
 * points costs a few hundred ms on a busy machine). `index` maps back to the full arrays, which
 * the cursor readout and the Loop keep using. The pass is sliced over several tasks (≈ 32k
 * samples each) so the page never stalls on it.
 */
function useDisplayColumns(t: Float64Array, input: Float64Array, output: Float64Array): Columns | null {
  const small = t.length <= DISPLAY_LIMIT;
  const [state, setState] = useState<{ src: Float64Array; cols: Columns } | null>(null);
  // Stable identity: the plot is rebuilt only when the columns really change.
  const direct = useMemo<Columns | null>(
    () => (small ? { t, input, output, index: null } : null),
    [t, input, output, small],
  );
  useEffect(() => {
    if (small) return;
    let cancelled = false;
    let timer = 0;
    const thinner = new MinMaxThinner([input, output], BUCKETS);
    // About 32k samples per slice, so the page never stalls on a million-point run.
    const perSlice = Math.max(1, Math.floor((BUCKETS * 32_768) / t.length));
    const step = () => {
      if (cancelled) return;
      if (!thinner.advance(perSlice)) {
        timer = window.setTimeout(step, 0);
        return;
      }
      const index = thinner.finish();
      setState({
        src: t,
        cols: { t: pickAt(t, index), input: pickAt(input, index), output: pickAt(output, index), index },
      });
    };
    step();
    return () => {
      cancelled = true;
      clearTimeout(timer);
    };
  }, [t, input, output, small]);
  if (small) return direct;
  return state && state.src === t ? state.cols : null;
}

/** Measured edges: a tick at the top of the plot, up for rising, down for falling. */
function drawEvents(u: uPlot, events: SimEvent[]) {
  if (!events.length) return;
  const ctx = u.ctx;
  const r = devicePixelRatio;
  const top = u.bbox.top;
  const xMin = u.scales.x.min!;
  const xMax = u.scales.x.max!;
  ctx.save();
  ctx.fillStyle = PLOT_COLORS.event;
  ctx.strokeStyle = "rgba(138,61,26,0.25)";
  ctx.lineWidth = r;
  let lastX = -Infinity;
  for (const e of events) {
    if (e.time < xMin || e.time > xMax) continue;
    const x = u.valToPos(e.time, "x", true);
    if (x - lastX < 3 * r) continue; // dense edges (chatter): one mark per few pixels
    lastX = x;
    ctx.beginPath();
    ctx.moveTo(x, top);
    ctx.lineTo(x, top + u.bbox.height);
    ctx.stroke();
    ctx.beginPath();
    if (e.edge === "rising") {
      ctx.moveTo(x - 4 * r, top + 8 * r);
      ctx.lineTo(x + 4 * r, top + 8 * r);
      ctx.lineTo(x, top + 1 * r);
    } else {
      ctx.moveTo(x - 4 * r, top + 1 * r);
      ctx.lineTo(x + 4 * r, top + 1 * r);
      ctx.lineTo(x, top + 8 * r);
    }
    ctx.closePath();
    ctx.fill();
  }
  ctx.restore();
}

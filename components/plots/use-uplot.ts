"use client";
// uPlot lifecycle in React: create in an effect, destroy in the cleanup (StrictMode mounts
// twice), follow the container's width with a ResizeObserver (flex parents need min-width: 0,
// uPlot#603). The plot is rebuilt only when `deps` change; data goes straight in as Float64Arrays.
import { useEffect, useRef, type DependencyList, type RefObject } from "react";
import uPlot from "uplot";
import "uplot/dist/uPlot.min.css";
import { formatTicks } from "@/lib/design/notation";

export function useUPlot(
  container: RefObject<HTMLDivElement | null>,
  build: (width: number) => { opts: uPlot.Options; data: uPlot.AlignedData } | null,
  deps: DependencyList,
): RefObject<uPlot | null> {
  const plot = useRef<uPlot | null>(null);
  useEffect(() => {
    const el = container.current;
    if (!el) return;
    let u: uPlot | null = null;
    let ro: ResizeObserver | null = null;
    let frame = 0;
    let timer = 0;
    // Built after the next animation frame, not in the React commit: on long runs the commit,
    // the page layout and uPlot's own pass then land in separate tasks instead of one long one.
    // The extra timeout gives each plot its own task: animation-frame callbacks of one frame run
    // in a single task, so the Trace and the Loop would otherwise be built back to back in it.
    const start = requestAnimationFrame(() => {
      timer = window.setTimeout(create, 0);
    });
    const create = () => {
      const width = Math.max(200, el.clientWidth);
      const made = build(width);
      if (!made) return;
      const inst = new uPlot({ ...made.opts, width }, made.data, el);
      u = inst;
      plot.current = inst;
      ro = new ResizeObserver(() => {
        cancelAnimationFrame(frame);
        frame = requestAnimationFrame(() => {
          const w = Math.max(200, el.clientWidth);
          if (Math.abs(w - inst.width) > 1) inst.setSize({ width: w, height: inst.height });
        });
      });
      ro.observe(el);
    };
    return () => {
      cancelAnimationFrame(start);
      clearTimeout(timer);
      cancelAnimationFrame(frame);
      ro?.disconnect();
      u?.destroy();
      plot.current = null;
    };
    // biome-ignore lint/correctness/useExhaustiveDependencies: the caller passes the dependency list that rebuilds the plot (deps)
  }, deps);
  return plot;
}

/**
 * Tick labels in engineering notation (lib/design/notation formatTicks): one SI prefix per axis,
 * enough decimals for each tick's own value. The labels are also written to the plot's root as
 * data-ticks-<axis> so a reader (or a browser test) can see what the canvas shows.
 */
export function siTicks(unit: string) {
  return (u: uPlot, splits: number[], axisIdx?: number): string[] => {
    const labels = formatTicks(splits, unit);
    if (u?.root && axisIdx !== undefined) u.root.dataset[`ticks${axisIdx}`] = labels.join("|");
    return labels;
  };
}

export { extent } from "@/lib/workbench/extent";

export const PLOT_COLORS = {
  input: "#3b4fa8",
  output: "#b5562a",
  rail: "#6b7587",
  threshold: "#4d7a3a",
  grid: "#eceee8",
  axis: "#3b4556",
  event: "#8a3d1a",
  capacitor: "#2f7d7a",
  /** The input in source units (own scale, right axis). */
  source: "#7b4a8f",
  /** The filter node (stage input behind the RC low-pass). */
  filtered: "#a17a12",
};

/**
 * Canvas fonts cannot use CSS variables: resolve next/font's generated family names from the
 * root element's custom properties (set by app/layout.tsx) once, in the browser.
 */
function family(variable: string, fallback: string): string {
  if (typeof document === "undefined") return fallback;
  const v = getComputedStyle(document.documentElement).getPropertyValue(variable).trim();
  return v ? `${v}, ${fallback}` : fallback;
}
export const monoFont = (px: number) => `${px}px ${family("--font-jb", "ui-monospace, monospace")}`;
export const sansFont = (px: number) => `${px}px ${family("--font-plex", "system-ui, sans-serif")}`;

/** Axis styling shared by every plot: graphite ticks, faint grid. */
export function axis(extra: Partial<uPlot.Axis> = {}): uPlot.Axis {
  return {
    stroke: PLOT_COLORS.axis,
    font: monoFont(11),
    labelFont: sansFont(12),
    grid: { stroke: PLOT_COLORS.grid, width: 1 },
    ticks: { stroke: "#d9ddd3", width: 1, size: 4 },
    ...extra,
  };
}

/** Draw a horizontal line at y-value `v` across the plotting area. */
export function hLine(u: uPlot, v: number, color: string, dash: number[], scale = "y"): void {
  const ctx = u.ctx;
  const y = Math.round(u.valToPos(v, scale, true)) + 0.5;
  if (y < u.bbox.top || y > u.bbox.top + u.bbox.height) return;
  ctx.save();
  ctx.strokeStyle = color;
  ctx.lineWidth = Math.max(1, devicePixelRatio);
  ctx.setLineDash(dash.map((d) => d * devicePixelRatio));
  ctx.beginPath();
  ctx.moveTo(u.bbox.left, y);
  ctx.lineTo(u.bbox.left + u.bbox.width, y);
  ctx.stroke();
  ctx.restore();
}

export function vLine(u: uPlot, v: number, color: string, dash: number[], scale = "x"): void {
  const ctx = u.ctx;
  const x = Math.round(u.valToPos(v, scale, true)) + 0.5;
  if (x < u.bbox.left || x > u.bbox.left + u.bbox.width) return;
  ctx.save();
  ctx.strokeStyle = color;
  ctx.lineWidth = Math.max(1, devicePixelRatio);
  ctx.setLineDash(dash.map((d) => d * devicePixelRatio));
  ctx.beginPath();
  ctx.moveTo(x, u.bbox.top);
  ctx.lineTo(x, u.bbox.top + u.bbox.height);
  ctx.stroke();
  ctx.restore();
}

/** Small label at the right end of a horizontal mark. */
export function tagRight(
  u: uPlot,
  v: number,
  text: string,
  color: string,
  scale = "y",
  side: "above" | "below" = "above",
): void {
  const ctx = u.ctx;
  const y = u.valToPos(v, scale, true);
  if (y < u.bbox.top || y > u.bbox.top + u.bbox.height) return;
  ctx.save();
  ctx.font = monoFont(10 * devicePixelRatio);
  ctx.fillStyle = color;
  ctx.textAlign = "right";
  ctx.textBaseline = side === "above" ? "bottom" : "top";
  ctx.fillText(
    text,
    u.bbox.left + u.bbox.width - 4 * devicePixelRatio,
    side === "above" ? y - 2 * devicePixelRatio : y + 2 * devicePixelRatio,
  );
  ctx.restore();
}

/**
 * Small label on a horizontal mark, at whichever end of the plot the drawn series leave clearer:
 * the right end unless more samples fall inside the label's box there than at the left end (a
 * threshold tag printed across the very curve it marks is unreadable). Drawn over the series on
 * a paper-coloured ground, so whatever still passes under it does not cross its letters.
 * Call from the `draw` hook (after the series).
 */
export function tagClear(u: uPlot, v: number, text: string, color: string, side: "above" | "below" = "above"): void {
  const ctx = u.ctx;
  const dpr = devicePixelRatio;
  const y = u.valToPos(v, "y", true);
  const { left, top, width, height } = u.bbox;
  if (y < top || y > top + height) return;
  ctx.save();
  ctx.font = monoFont(10 * dpr);
  const w = ctx.measureText(text).width + 4 * dpr;
  const h = 12 * dpr;
  const y0 = side === "above" ? y - 2 * dpr - h : y + 2 * dpr;
  const boxes = [left + width - 4 * dpr - w, left + 4 * dpr];
  const hits = boxes.map((x0) => samplesInBox(u, x0, y0, x0 + w, y0 + h));
  const x0 = hits[1] < hits[0] ? boxes[1] : boxes[0];
  ctx.fillStyle = "rgba(255, 255, 255, 0.85)";
  ctx.fillRect(x0, y0, w, h);
  ctx.fillStyle = color;
  ctx.textAlign = "left";
  ctx.textBaseline = "middle";
  ctx.fillText(text, x0 + 2 * dpr, y0 + h / 2);
  ctx.restore();
}

/** How many drawn samples (every shown series, on its own scale) land inside a canvas box. */
function samplesInBox(u: uPlot, x0: number, y0: number, x1: number, y1: number): number {
  const xs = u.data[0];
  // Samples are ordered in x: find the first inside the box, then step until past it.
  let lo = 0;
  let hi = xs.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (u.valToPos(xs[mid], "x", true) < x0) lo = mid + 1;
    else hi = mid;
  }
  let n = 0;
  for (let s = 1; s < u.series.length; s++) {
    const series = u.series[s];
    const ys = u.data[s];
    if (!series.show || !ys) continue;
    const scale = series.scale ?? "y";
    for (let i = lo; i < xs.length; i++) {
      const px = u.valToPos(xs[i], "x", true);
      if (px > x1) break;
      const yv = ys[i];
      if (yv == null) continue;
      const py = u.valToPos(yv, scale, true);
      if (py >= y0 && py <= y1) n++;
    }
  }
  return n;
}

/**
 * Wheel zooms the x scale about the pointer; Shift+drag (or middle-button drag) pans.
 * Plain drag keeps uPlot's own box zoom.
 */
export function wheelPan(onChange?: () => void): uPlot.Plugin {
  return {
    hooks: {
      ready: (u) => {
        const over = u.over;
        over.addEventListener(
          "wheel",
          (e) => {
            e.preventDefault();
            const { left } = u.cursor;
            if (left == null || left < 0) return;
            const xMin = u.scales.x.min!;
            const xMax = u.scales.x.max!;
            const at = u.posToVal(left, "x");
            const f = e.deltaY < 0 ? 0.8 : 1.25;
            u.setScale("x", { min: at - (at - xMin) * f, max: at + (xMax - at) * f });
            onChange?.();
          },
          { passive: false },
        );
        over.addEventListener(
          "mousedown",
          (e) => {
            if (!(e.shiftKey || e.button === 1)) return;
            e.preventDefault();
            e.stopPropagation();
            const x0 = e.clientX;
            const min0 = u.scales.x.min!;
            const max0 = u.scales.x.max!;
            const perPx = ((max0 - min0) / u.bbox.width) * devicePixelRatio;
            const move = (m: MouseEvent) => {
              const dx = (m.clientX - x0) * perPx;
              u.setScale("x", { min: min0 - dx, max: max0 - dx });
            };
            const up = () => {
              window.removeEventListener("mousemove", move);
              window.removeEventListener("mouseup", up);
              onChange?.();
            };
            window.addEventListener("mousemove", move);
            window.addEventListener("mouseup", up);
          },
          true,
        );
      },
    },
  };
}

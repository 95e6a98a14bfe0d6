"use client";
// uPlot lifecycle in React: create in an effect, destroy in the cleanup (StrictMode mounts
// twice), follow the container's width with a ResizeObserver (flex parents need min-width: 0,
// uPlot#603). The plot is rebuilt only when `deps` change; data goes straight in as Float64Arrays.
import { useEffect, useRef, type DependencyList, type RefObject } from "react";
import uPlot from "uplot";
import "uplot/dist/uPlot.min.css";

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
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, deps);
  return plot;
}

/** Tick labels in the SI prefix that suits the visible span: 0, 20 ms, 40 ms … */
export function siTicks(unit: string) {
  return (_u: uPlot, splits: number[]): string[] => {
    let span = 0;
    for (const v of splits) span = Math.max(span, Math.abs(v));
    const [scale, prefix] = pickPrefix(span);
    const step = splits.length > 1 ? Math.abs(splits[1] - splits[0]) / scale : 1;
    const dec = Math.max(0, Math.min(6, -Math.floor(Math.log10(step || 1) + 1e-9)));
    return splits.map((v) => `${(v / scale).toFixed(dec)} ${prefix}${unit}`.trim());
  };
}

export function pickPrefix(span: number): [number, string] {
  if (span >= 1e6) return [1e6, "M"];
  if (span >= 1e3) return [1e3, "k"];
  if (span >= 1 || span === 0) return [1, ""];
  if (span >= 1e-3) return [1e-3, "m"];
  if (span >= 1e-6) return [1e-6, "µ"];
  return [1e-9, "n"];
}

/** [min, max] of a column in one pass (no spread of a million arguments). */
export function extent(a: ArrayLike<number>): [number, number] {
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i < a.length; i++) {
    const v = a[i];
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  return [lo, hi];
}

export const PLOT_COLORS = {
  input: "#3b4fa8",
  output: "#b5562a",
  rail: "#6b7587",
  threshold: "#4d7a3a",
  grid: "#eceee8",
  axis: "#3b4556",
  event: "#8a3d1a",
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
export function tagRight(u: uPlot, v: number, text: string, color: string, scale = "y", side: "above" | "below" = "above"): void {
  const ctx = u.ctx;
  const y = u.valToPos(v, scale, true);
  if (y < u.bbox.top || y > u.bbox.top + u.bbox.height) return;
  ctx.save();
  ctx.font = monoFont(10 * devicePixelRatio);
  ctx.fillStyle = color;
  ctx.textAlign = "right";
  ctx.textBaseline = side === "above" ? "bottom" : "top";
  ctx.fillText(text, u.bbox.left + u.bbox.width - 4 * devicePixelRatio, side === "above" ? y - 2 * devicePixelRatio : y + 2 * devicePixelRatio);
  ctx.restore();
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
        over.addEventListener("mousedown", (e) => {
          if (!(e.shiftKey || e.button === 1)) return;
          e.preventDefault();
          e.stopPropagation();
          const x0 = e.clientX;
          const min0 = u.scales.x.min!;
          const max0 = u.scales.x.max!;
          const perPx = (max0 - min0) / u.bbox.width * devicePixelRatio;
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
        }, true);
      },
    },
  };
}


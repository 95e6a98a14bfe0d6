"use client";
// Static plots for comparisons and the review report: series drawn on a canvas once and shown
// as a PNG <img>, so the picture prints (and lands in a PDF) exactly as it looks on screen.
// Colours and tick notation follow the interactive plots (components/plots, lib/design/notation).
import { useEffect, useState } from "react";
import { PLOT_COLORS } from "@/components/plots/use-uplot";
import { formatTicks } from "@/lib/design/notation";

export interface PlotSeries {
  x: ArrayLike<number>;
  y: ArrayLike<number>;
  color: string;
  width?: number;
  dash?: number[];
  label: string;
}

export interface PlotMark {
  y: number;
  color: string;
  label: string;
}

export interface PlotSpec {
  series: PlotSeries[];
  xUnit: string;
  yUnit: string;
  marks?: PlotMark[];
}

function niceStep(span: number, count: number): number {
  const raw = span / Math.max(1, count);
  const mag = 10 ** Math.floor(Math.log10(raw));
  const n = raw / mag;
  return (n < 1.5 ? 1 : n < 3.5 ? 2 : n < 7.5 ? 5 : 10) * mag;
}

function ticks(lo: number, hi: number, count: number): number[] {
  const step = niceStep(hi - lo || 1, count);
  const out: number[] = [];
  for (let v = Math.ceil(lo / step) * step; v <= hi + step * 1e-9; v += step)
    out.push(Math.abs(v) < step * 1e-9 ? 0 : v);
  return out;
}

function range(spec: PlotSpec, axis: "x" | "y"): [number, number] {
  let lo = Infinity;
  let hi = -Infinity;
  for (const s of spec.series) {
    const a = s[axis];
    for (let i = 0; i < a.length; i++) {
      const v = a[i];
      if (!Number.isFinite(v)) continue;
      if (v < lo) lo = v;
      if (v > hi) hi = v;
    }
  }
  if (axis === "y")
    for (const m of spec.marks ?? []) {
      if (!Number.isFinite(m.y)) continue;
      lo = Math.min(lo, m.y);
      hi = Math.max(hi, m.y);
    }
  if (!Number.isFinite(lo)) return [0, 1];
  if (hi === lo) return [lo - 1, hi + 1];
  if (axis === "y") {
    const pad = (hi - lo) * 0.06;
    return [lo - pad, hi + pad];
  }
  return [lo, hi];
}

/** Draw the plot at `width` × `height` CSS pixels (× `scale` device pixels) and answer a PNG data URL. */
export function renderPlotPng(spec: PlotSpec, width: number, height: number, scale = 2): string {
  const canvas = document.createElement("canvas");
  canvas.width = Math.round(width * scale);
  canvas.height = Math.round(height * scale);
  const ctx = canvas.getContext("2d");
  if (!ctx) return "";
  ctx.scale(scale, scale);
  ctx.fillStyle = "#ffffff";
  ctx.fillRect(0, 0, width, height);
  const left = 64;
  const right = 26;
  const top = 10;
  const bottom = 30;
  const w = width - left - right;
  const h = height - top - bottom;
  const [x0, x1] = range(spec, "x");
  const [y0, y1] = range(spec, "y");
  const px = (x: number) => left + ((x - x0) / (x1 - x0)) * w;
  const py = (y: number) => top + h - ((y - y0) / (y1 - y0)) * h;
  ctx.font = "11px ui-monospace, monospace";
  ctx.fillStyle = PLOT_COLORS.axis;
  ctx.strokeStyle = PLOT_COLORS.grid;
  ctx.lineWidth = 1;
  const xt = ticks(x0, x1, 6);
  const yt = ticks(y0, y1, 5);
  const xl = formatTicks(xt, spec.xUnit);
  const yl = formatTicks(yt, spec.yUnit);
  ctx.textAlign = "center";
  ctx.textBaseline = "top";
  xt.forEach((v, i) => {
    const x = Math.round(px(v)) + 0.5;
    ctx.beginPath();
    ctx.moveTo(x, top);
    ctx.lineTo(x, top + h);
    ctx.stroke();
    ctx.fillText(xl[i], x, top + h + 6);
  });
  ctx.textAlign = "right";
  ctx.textBaseline = "middle";
  yt.forEach((v, i) => {
    const y = Math.round(py(v)) + 0.5;
    ctx.beginPath();
    ctx.moveTo(left, y);
    ctx.lineTo(left + w, y);
    ctx.stroke();
    ctx.fillText(yl[i], left - 6, y);
  });
  ctx.strokeStyle = "#c9cec4";
  ctx.strokeRect(left + 0.5, top + 0.5, w, h);
  ctx.save();
  ctx.beginPath();
  ctx.rect(left, top, w, h);
  ctx.clip();
  // Marks close together (the two switching points) label one above and the next below its line.
  let lastLabelY = -Infinity;
  for (const m of spec.marks ?? []) {
    const y = Math.round(py(m.y)) + 0.5;
    const below = Math.abs(y - lastLabelY) < 12;
    lastLabelY = y;
    ctx.setLineDash([6, 4]);
    ctx.strokeStyle = m.color;
    ctx.beginPath();
    ctx.moveTo(left, y);
    ctx.lineTo(left + w, y);
    ctx.stroke();
    ctx.setLineDash([]);
    ctx.fillStyle = m.color;
    ctx.textAlign = "right";
    ctx.textBaseline = below ? "top" : "bottom";
    ctx.font = "10px system-ui, sans-serif";
    ctx.fillText(m.label, left + w - 4, below ? y + 2 : y - 2);
  }
  for (const s of spec.series) {
    ctx.strokeStyle = s.color;
    ctx.lineWidth = s.width ?? 1.5;
    ctx.setLineDash(s.dash ?? []);
    ctx.beginPath();
    let pen = false;
    const n = Math.min(s.x.length, s.y.length);
    for (let i = 0; i < n; i++) {
      const xv = s.x[i];
      const yv = s.y[i];
      if (!Number.isFinite(xv) || !Number.isFinite(yv)) {
        pen = false;
        continue;
      }
      if (pen) ctx.lineTo(px(xv), py(yv));
      else ctx.moveTo(px(xv), py(yv));
      pen = true;
    }
    ctx.stroke();
  }
  ctx.restore();
  return canvas.toDataURL("image/png");
}

/** The plot as an image with its legend beneath; `testId` marks the <img> for tests. */
export function PlotImage({
  spec,
  alt,
  width = 760,
  height = 280,
  testId,
}: {
  spec: PlotSpec;
  alt: string;
  width?: number;
  height?: number;
  testId?: string;
}) {
  const [src, setSrc] = useState<string | null>(null);
  useEffect(() => {
    setSrc(renderPlotPng(spec, width, height));
  }, [spec, width, height]);
  return (
    <figure className="flex flex-col gap-1.5">
      {src ? (
        // biome-ignore lint/performance/noImgElement: a generated data URL, nothing for next/image to optimise
        <img
          src={src}
          alt={alt}
          width={width}
          height={height}
          className="h-auto w-full max-w-full"
          data-testid={testId}
        />
      ) : (
        <div style={{ aspectRatio: `${width} / ${height}` }} className="w-full animate-pulse rounded bg-paper-sunk" />
      )}
      <figcaption className="flex flex-wrap gap-x-4 gap-y-1 text-[11px] text-ink-soft">
        {spec.series.map((s) => (
          <span key={s.label} className="inline-flex items-center gap-1.5">
            <svg width="22" height="6" aria-hidden="true">
              <line x1="0" y1="3" x2="22" y2="3" stroke={s.color} strokeWidth={2} strokeDasharray={s.dash?.join(" ")} />
            </svg>
            {s.label}
          </span>
        ))}
      </figcaption>
    </figure>
  );
}

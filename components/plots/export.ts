// Exports of what a plot shows: the canvas as PNG, the samples as CSV (papaparse).
import type uPlot from "uplot";
import Papa from "papaparse";
import { sansFont } from "./use-uplot";
import { formatTime, smallestStep, timeDecimals } from "@/lib/workbench/sample-times";

function download(blob: Blob, fileName: string) {
  const a = document.createElement("a");
  a.href = URL.createObjectURL(blob);
  a.download = fileName;
  document.body.appendChild(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(a.href), 2000);
}

export interface PngHeading {
  /** What the plot is ("Trace — input and output against time"). */
  title: string;
  /** Scenario, run and the like, one line each; the export date is added. */
  lines?: string[];
  /** The colours and what they mean, drawn as a key under the title. */
  legend?: { color: string; label: string; dashed?: boolean; tick?: boolean }[];
  xUnit?: string;
  yUnit?: string;
}

/**
 * Save the plot canvas (axes, traces and marks) as a PNG that stands on its own: a heading with
 * the title, scenario/run lines and the export date, a legend, and the axis units.
 */
export function exportPlotPng(u: uPlot, heading: string | PngHeading, fileName: string): void {
  const h: PngHeading = typeof heading === "string" ? { title: heading } : heading;
  const src = u.ctx.canvas;
  const ratio = src.width / Math.max(1, u.width);
  const px = (v: number) => Math.round(v * ratio);
  const stamp = `Exported ${new Date().toISOString().slice(0, 16).replace("T", " ")} UTC`;
  const lines = [...(h.lines ?? []).filter(Boolean), stamp];
  const units =
    h.xUnit || h.yUnit
      ? `Axes: ${[h.xUnit ? `horizontal in ${h.xUnit}` : "", h.yUnit ? `vertical in ${h.yUnit}` : ""].filter(Boolean).join(", ")}`
      : "";
  const legendRows = h.legend?.length ? 1 : 0;
  const head = px(12 + 20 + lines.length * 17 + (units ? 17 : 0) + legendRows * 20 + 8);
  const out = document.createElement("canvas");
  out.width = src.width;
  out.height = src.height + head;
  const ctx = out.getContext("2d");
  if (!ctx) return;
  ctx.fillStyle = "#ffffff";
  ctx.fillRect(0, 0, out.width, out.height);
  ctx.textBaseline = "middle";
  let y = px(12 + 10);
  ctx.fillStyle = "#1d2430";
  ctx.font = `600 ${sansFont(Math.round(14 * ratio))}`;
  ctx.fillText(h.title, px(10), y);
  ctx.font = sansFont(Math.round(12 * ratio));
  ctx.fillStyle = "#3b4556";
  for (const line of units ? [...lines, units] : lines) {
    y += px(17);
    ctx.fillText(line, px(10), y);
  }
  if (h.legend?.length) {
    y += px(20);
    let x = px(10);
    for (const item of h.legend) {
      ctx.strokeStyle = item.color;
      ctx.fillStyle = item.color;
      ctx.lineWidth = px(2);
      ctx.setLineDash(item.dashed ? [px(4), px(3)] : []);
      if (item.tick) {
        ctx.beginPath();
        ctx.moveTo(x + px(5), y - px(4));
        ctx.lineTo(x + px(13), y - px(4));
        ctx.lineTo(x + px(9), y + px(3));
        ctx.closePath();
        ctx.fill();
      } else {
        ctx.beginPath();
        ctx.moveTo(x, y);
        ctx.lineTo(x + px(18), y);
        ctx.stroke();
      }
      ctx.setLineDash([]);
      ctx.fillStyle = "#3b4556";
      ctx.fillText(item.label, x + px(23), y);
      x += px(23) + ctx.measureText(item.label).width + px(16);
    }
  }
  ctx.drawImage(src, 0, head);
  out.toBlob((blob) => blob && download(blob, fileName), "image/png");
}

/** Time, input and output columns as CSV, SI units in the header. */
export function downloadSamplesCsv(
  t: ArrayLike<number>,
  input: ArrayLike<number>,
  output: ArrayLike<number>,
  fileName: string,
  /** Further columns of the same length (source units, filter node, capacitor); others are skipped. */
  extra: { name: string; values: ArrayLike<number> }[] = [],
): void {
  download(new Blob([samplesCsv(t, input, output, extra)], { type: "text/csv" }), fileName);
}

/** The samples CSV text: time_s, input_V (the stage-input pin), output_V, then the extra columns. */
export function samplesCsv(
  t: ArrayLike<number>,
  input: ArrayLike<number>,
  output: ArrayLike<number>,
  extra: { name: string; values: ArrayLike<number> }[] = [],
): string {
  // Times to the precision the sample grid needs, not binary noise (0.00020002, not 0.00020002000200020003).
  const decimals = timeDecimals(smallestStep(t));
  const cols = extra.filter((c) => c.values.length === t.length);
  const rows: (number | string)[][] = new Array(t.length);
  for (let i = 0; i < t.length; i++) {
    const row: (number | string)[] = [formatTime(t[i], decimals), input[i], output[i]];
    for (const c of cols) row.push(c.values[i]);
    rows[i] = row;
  }
  return Papa.unparse({ fields: ["time_s", "input_V", "output_V", ...cols.map((c) => c.name)], data: rows });
}

// Exports of what a plot shows: the canvas as PNG, the samples as CSV (papaparse).
import type uPlot from "uplot";
import Papa from "papaparse";
import { sansFont } from "./use-uplot";

function download(blob: Blob, fileName: string) {
  const a = document.createElement("a");
  a.href = URL.createObjectURL(blob);
  a.download = fileName;
  document.body.appendChild(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(a.href), 2000);
}

/** Save the plot canvas (axes, traces and marks) as a PNG on a white ground with a title strip. */
export function exportPlotPng(u: uPlot, title: string, fileName: string): void {
  const src = u.ctx.canvas;
  const ratio = src.width / Math.max(1, u.width);
  const strip = Math.round(28 * ratio);
  const out = document.createElement("canvas");
  out.width = src.width;
  out.height = src.height + strip;
  const ctx = out.getContext("2d");
  if (!ctx) return;
  ctx.fillStyle = "#ffffff";
  ctx.fillRect(0, 0, out.width, out.height);
  ctx.fillStyle = "#1d2430";
  ctx.font = sansFont(Math.round(13 * ratio));
  ctx.textBaseline = "middle";
  ctx.fillText(title, Math.round(10 * ratio), strip / 2);
  ctx.drawImage(src, 0, strip);
  out.toBlob((blob) => blob && download(blob, fileName), "image/png");
}


/** Time, input and output columns as CSV, SI units in the header. */
export function downloadSamplesCsv(t: ArrayLike<number>, input: ArrayLike<number>, output: ArrayLike<number>, fileName: string): void {
  const rows: number[][] = new Array(t.length);
  for (let i = 0; i < t.length; i++) rows[i] = [t[i], input[i], output[i]];
  const csv = Papa.unparse({ fields: ["time_s", "input_V", "output_V"], data: rows });
  download(new Blob([csv], { type: "text/csv" }), fileName);
}

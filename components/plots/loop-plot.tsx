"use client";
// "Loop": output against input from the same run — the hysteresis loop of a trigger, the
// transfer line and its clipping knees for a gain stage. uPlot supplies the frame, scales,
// cursor and box zoom; the x–y path (input is not monotonic) is stroked in a draw hook, one
// segment per pixel step, so a million samples stay cheap; dense loops are rasterised in time
// slices and composited when done.
import { useEffect, useRef } from "react";
import type uPlot from "uplot";
import { PlotToolbar, Readout, cursorItems } from "./plot-chrome";
import { exportPlotPng } from "./export";
import { PLOT_COLORS, axis, extent, hLine, siTicks, tagRight, useUPlot, vLine } from "./use-uplot";

export interface LoopPlotProps {
  input: Float64Array;
  output: Float64Array;
  t: Float64Array;
  rails: { high: number; low: number };
  thresholds?: { upper: number | null; lower: number | null } | null;
  cursorIdx: number | null;
  onCursor?: (idx: number | null) => void;
  height?: number;
  fileName?: string;
  /** Scenario and run lines printed on an exported PNG. */
  exportTitle?: string[];
  /** Legend words for the threshold lines. */
  thresholdLabel?: string;
}

export function LoopPlot(props: LoopPlotProps) {
  const {
    input,
    output,
    t,
    rails,
    thresholds,
    cursorIdx,
    onCursor,
    height = 300,
    fileName = "loop.png",
    exportTitle,
    thresholdLabel = "designed switching points",
  } = props;
  const box = useRef<HTMLDivElement>(null);
  const marker = useRef<HTMLDivElement | null>(null);
  const emitted = useRef<number | null>(null);
  const cb = useRef(onCursor);
  cb.current = onCursor;
  const xr = useRef<[number, number]>([0, 1]);

  const plot = useUPlot(
    box,
    (width) => {
      if (input.length === 0) return null;
      let [x0, x1] = extent(input);
      if (!(x1 > x0)) [x0, x1] = [x0 - 0.5, x1 + 0.5];
      const [o0, o1] = extent(output);
      const y0 = Math.min(o0, rails.low);
      const y1 = Math.max(o1, rails.high);
      const pad = 0.04 * (x1 - x0);
      xr.current = [x0 - pad, x1 + pad];
      // A sorted stand-in series spanning the extents keeps uPlot's auto-ranging honest in any
      // zoom window; it is never drawn.
      const N = 64;
      const fx = new Float64Array(N);
      const fy = new Float64Array(N);
      for (let i = 0; i < N; i++) {
        fx[i] = x0 - pad + ((x1 - x0 + 2 * pad) * i) / (N - 1);
        fy[i] = i % 2 ? y1 : y0;
      }
      const stride = Math.max(1, Math.ceil(input.length / 4000));
      const raster: RasterCache = { key: "", image: null, timer: 0 };
      let frame = 0;
      const opts: uPlot.Options = {
        width,
        height,
        legend: { show: false },
        scales: { x: { time: false, range: () => [xr.current[0], xr.current[1]] } },
        cursor: { drag: { x: true, y: false, setScale: true }, points: { show: false } },
        series: [{}, { label: "frame", stroke: "transparent", paths: () => null, points: { show: false } }],
        axes: [
          axis({ values: siTicks("V"), size: 34, label: "input", labelSize: 16 }),
          axis({ values: siTicks("V"), size: 64, label: "output", labelSize: 16 }),
        ],
        hooks: {
          ready: [
            (u) => {
              const m = document.createElement("div");
              m.className = "rw-loop-marker";
              m.style.cssText =
                "position:absolute;width:9px;height:9px;margin:-5px 0 0 -5px;border-radius:50%;border:2px solid #8a3d1a;background:#fff;pointer-events:none;display:none";
              u.over.appendChild(m);
              marker.current = m;
            },
          ],
          drawAxes: [
            (u) => {
              hLine(u, rails.high, PLOT_COLORS.rail, [2, 3]);
              hLine(u, rails.low, PLOT_COLORS.rail, [2, 3]);
              tagRight(u, rails.high, "Voh", PLOT_COLORS.rail);
              tagRight(u, rails.low, "Vol", PLOT_COLORS.rail);
              if (thresholds?.upper != null) vLine(u, thresholds.upper, PLOT_COLORS.threshold, [7, 4]);
              if (thresholds?.lower != null) vLine(u, thresholds.lower, PLOT_COLORS.threshold, [7, 4]);
            },
          ],
          draw: [(u) => drawLoop(u, input, output, raster)],
          destroy: [() => clearTimeout(raster.timer)],
          setCursor: [
            (u) => {
              cancelAnimationFrame(frame);
              frame = requestAnimationFrame(() => {
                const { left, top } = u.cursor;
                let idx: number | null = null;
                if (left != null && top != null && left >= 0) {
                  // Nearest sample on screen among an even subset (≤ 4000 candidates).
                  let best = Infinity;
                  for (let i = 0; i < input.length; i += stride) {
                    const dx = u.valToPos(input[i], "x") - left;
                    const dy = u.valToPos(output[i], "y") - top;
                    const d = dx * dx + dy * dy;
                    if (d < best) {
                      best = d;
                      idx = i;
                    }
                  }
                }
                if (idx === emitted.current) return;
                emitted.current = idx;
                placeMarker(u, idx);
                cb.current?.(idx);
              });
            },
          ],
        },
      };
      return { opts, data: [fx, fy] as unknown as uPlot.AlignedData };
    },
    [input, output, rails.high, rails.low, thresholds?.upper, thresholds?.lower, height],
  );

  function placeMarker(u: uPlot, idx: number | null) {
    const m = marker.current;
    if (!m) return;
    if (idx == null || idx >= input.length) {
      m.style.display = "none";
      return;
    }
    const x = u.valToPos(input[idx], "x");
    const y = u.valToPos(output[idx], "y");
    const inside = x >= 0 && y >= 0 && x <= u.over.clientWidth && y <= u.over.clientHeight;
    m.style.display = inside ? "block" : "none";
    m.style.left = `${x}px`;
    m.style.top = `${y}px`;
  }

  // biome-ignore lint/correctness/useExhaustiveDependencies: the marker follows the cursor only; the plot instance is read through its ref
  useEffect(() => {
    const u = plot.current;
    if (!u || cursorIdx === emitted.current) return;
    emitted.current = cursorIdx;
    placeMarker(u, cursorIdx);
  }, [cursorIdx, plot]);

  const reset = () => plot.current?.setScale("x", { min: xr.current[0], max: xr.current[1] });
  const i = cursorIdx != null && cursorIdx < input.length ? cursorIdx : null;
  const legend = [
    { color: PLOT_COLORS.output, label: "output vs input" },
    ...(thresholds && (thresholds.upper != null || thresholds.lower != null)
      ? [{ color: PLOT_COLORS.threshold, label: thresholdLabel, dashed: true }]
      : []),
    { color: PLOT_COLORS.rail, label: "output limits", dashed: true },
  ];

  return (
    <div className="min-w-0" data-testid="loop-plot">
      <PlotToolbar
        legend={legend}
        onReset={reset}
        onPng={() =>
          plot.current &&
          exportPlotPng(
            plot.current,
            {
              title: "Loop — output against input",
              lines: exportTitle,
              legend,
              xUnit: "V (input)",
              yUnit: "V (output)",
            },
            fileName,
          )
        }
      />
      <div ref={box} className="min-w-0" />
      <Readout
        items={cursorItems(t, input, output, i)}
        hint="ring follows the Trace cursor · drag to zoom the input axis"
      />
    </div>
  );
}

/** Above this many samples the loop is rasterised by hand: a canvas path of 10⁵+ noisy segments takes seconds to stroke. */
const PATH_LIMIT = 20_000;
/** Main-thread budget per raster slice; a 2·10⁵-sample noisy loop takes ≈ 50 ms in one piece. */
const SLICE_MS = 8;

/** The dense loop's finished raster for one frame geometry (bbox + scales), reused by redraws. */
interface RasterCache {
  key: string;
  image: HTMLCanvasElement | null;
  timer: number;
}

function drawLoop(u: uPlot, input: Float64Array, output: Float64Array, raster: RasterCache) {
  const n = input.length;
  if (!n) return;
  const ctx = u.ctx;
  const { left, top, width, height } = u.bbox;
  // Pixel transform computed once; valToPos per point would be 10× slower on 1e6 samples.
  const xMin = u.scales.x.min!;
  const xMax = u.scales.x.max!;
  const yMin = u.scales.y.min!;
  const yMax = u.scales.y.max!;
  const kx = width / (xMax - xMin);
  const ky = height / (yMax - yMin);
  if (n > PATH_LIMIT) {
    // Rasterised in time slices off the draw itself, then composited by a cheap redraw, so a
    // dense loop never holds the main thread in one long task (first draw or zoom).
    const key = [left, top, width, height, xMin, xMax, yMin, yMax].join(",");
    if (raster.key === key) {
      if (raster.image) ctx.drawImage(raster.image, Math.round(left), Math.round(top));
      return;
    }
    clearTimeout(raster.timer);
    raster.key = key;
    raster.image = null;
    rasterLoop(input, output, width, height, xMin, yMax, kx, ky, raster, () => {
      if (raster.key === key) u.redraw(false, false);
    });
    if (raster.image) ctx.drawImage(raster.image, Math.round(left), Math.round(top));
    return;
  }
  ctx.save();
  ctx.beginPath();
  ctx.rect(left, top, width, height);
  ctx.clip();
  ctx.strokeStyle = PLOT_COLORS.output;
  ctx.lineWidth = 1.6 * devicePixelRatio;
  ctx.lineJoin = "round";
  ctx.beginPath();
  let px = Math.round(left + (input[0] - xMin) * kx);
  let py = Math.round(top + (yMax - output[0]) * ky);
  ctx.moveTo(px, py);
  for (let i = 1; i < n; i++) {
    const x = Math.round(left + (input[i] - xMin) * kx);
    const y = Math.round(top + (yMax - output[i]) * ky);
    if (x === px && y === py) continue;
    ctx.lineTo(x, y);
    px = x;
    py = y;
  }
  ctx.stroke();
  ctx.restore();
}

/**
 * Dense loops: every segment drawn with integer line stepping into a pixel buffer (2 px pen),
 * sliced over tasks of ≈ SLICE_MS; the finished buffer lands in `raster.image` and `done` runs.
 * A newer geometry (raster.key changed) abandons the job.
 */
function rasterLoop(
  input: Float64Array,
  output: Float64Array,
  width: number,
  height: number,
  xMin: number,
  yMax: number,
  kx: number,
  ky: number,
  raster: RasterCache,
  done: () => void,
) {
  const key = raster.key;
  const w = Math.max(1, Math.ceil(width));
  const h = Math.max(1, Math.ceil(height));
  const buf = new Uint32Array(w * h);
  const ink = 0xff2a56b5; // copper #b5562a as little-endian RGBA
  // A 2-pixel pen (x, x+1): enough weight to read, half the writes of a square stamp.
  const plot = (x: number, y: number) => {
    if (x >= 0 && y >= 0 && x < w - 1 && y < h) buf[y * w + x] = buf[y * w + x + 1] = ink;
  };
  let x0 = Math.round((input[0] - xMin) * kx);
  let y0 = Math.round((yMax - output[0]) * ky);
  plot(x0, y0);
  let k = 1;
  const step = () => {
    if (raster.key !== key) return;
    const started = performance.now();
    while (k < input.length) {
      const end = Math.min(input.length, k + 4096);
      for (; k < end; k++) {
        const x1 = Math.round((input[k] - xMin) * kx);
        const y1 = Math.round((yMax - output[k]) * ky);
        if (x1 === x0 && y1 === y0) continue;
        // Integer line stepping between successive samples (Bresenham).
        let x = x0;
        let y = y0;
        const dx = Math.abs(x1 - x0);
        const dy = -Math.abs(y1 - y0);
        const sx = x0 < x1 ? 1 : -1;
        const sy = y0 < y1 ? 1 : -1;
        let err = dx + dy;
        // Segments entirely off one side are skipped (zoomed views).
        if (!((x0 < 0 && x1 < 0) || (x0 >= w && x1 >= w) || (y0 < 0 && y1 < 0) || (y0 >= h && y1 >= h))) {
          for (let guard = 0; guard < 4 * (w + h); guard++) {
            plot(x, y);
            if (x === x1 && y === y1) break;
            const e2 = 2 * err;
            if (e2 >= dy) {
              err += dy;
              x += sx;
            }
            if (e2 <= dx) {
              err += dx;
              y += sy;
            }
          }
        }
        x0 = x1;
        y0 = y1;
      }
      if (performance.now() - started > SLICE_MS && k < input.length) {
        raster.timer = window.setTimeout(step, 0);
        return;
      }
    }
    const off = document.createElement("canvas");
    off.width = w;
    off.height = h;
    const octx = off.getContext("2d");
    if (!octx) return;
    octx.putImageData(new ImageData(new Uint8ClampedArray(buf.buffer), w, h), 0, 0);
    raster.image = off;
    // Finished within the draw that started it: that draw composites it itself (no nested redraw).
    if (!sync) done();
  };
  let sync = true;
  step();
  sync = false;
}

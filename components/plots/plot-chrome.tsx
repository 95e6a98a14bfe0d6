"use client";
// The strip above and below each plot: a legend of what the colours mean, view controls,
// PNG export, and the cursor readout.
import { formatQuantity } from "@/lib/design/notation";

export interface LegendItem {
  color: string;
  label: string;
  dashed?: boolean;
  tick?: boolean;
}

function Swatch({ item }: { item: LegendItem }) {
  return (
    <span className="inline-flex items-center gap-1.5 whitespace-nowrap text-[11.5px] text-ink-soft">
      <svg width="18" height="8" aria-hidden>
        {item.tick ? (
          <path d="M5 1 L13 1 L9 7 Z" fill={item.color} />
        ) : (
          <line
            x1="0"
            y1="4"
            x2="18"
            y2="4"
            stroke={item.color}
            strokeWidth="2"
            strokeDasharray={item.dashed ? "4 3" : undefined}
          />
        )}
      </svg>
      {item.label}
    </span>
  );
}

const btn =
  "h-6 min-w-6 rounded border border-paper-line bg-white px-1.5 text-[11.5px] text-ink-soft hover:border-ink-faint hover:text-ink";

export function PlotToolbar({
  legend,
  onZoomIn,
  onZoomOut,
  onPanLeft,
  onPanRight,
  onReset,
  onPng,
}: {
  legend: LegendItem[];
  onZoomIn?: () => void;
  onZoomOut?: () => void;
  onPanLeft?: () => void;
  onPanRight?: () => void;
  onReset: () => void;
  onPng: () => void;
}) {
  return (
    <div className="mb-1 flex flex-wrap items-center justify-between gap-x-4 gap-y-1">
      <div className="flex flex-wrap items-center gap-x-3 gap-y-0.5">
        {legend.map((l) => (
          <Swatch key={l.label} item={l} />
        ))}
      </div>
      <div className="flex items-center gap-1" role="toolbar" aria-label="Plot view">
        {onPanLeft ? (
          <button type="button" className={btn} onClick={onPanLeft} title="Pan left" aria-label="Pan left">
            ‹
          </button>
        ) : null}
        {onZoomIn ? (
          <button type="button" className={btn} onClick={onZoomIn} title="Zoom in" aria-label="Zoom in">
            +
          </button>
        ) : null}
        {onZoomOut ? (
          <button type="button" className={btn} onClick={onZoomOut} title="Zoom out" aria-label="Zoom out">
            −
          </button>
        ) : null}
        {onPanRight ? (
          <button type="button" className={btn} onClick={onPanRight} title="Pan right" aria-label="Pan right">
            ›
          </button>
        ) : null}
        <button type="button" className={btn} onClick={onReset} title="Show the whole run">
          Fit
        </button>
        <button type="button" className={btn} onClick={onPng} title="Save this plot as a PNG image">
          PNG
        </button>
      </div>
    </div>
  );
}

export function Readout({ items, hint }: { items: [string, number, string][] | null; hint: string }) {
  return (
    <div className="mt-1 flex min-h-5 flex-wrap items-center justify-between gap-x-4 text-[11.5px]">
      <div className="flex flex-wrap gap-x-4 font-mono text-ink" data-testid="cursor-readout">
        {items ? (
          items.map(([k, v, u]) => (
            <span key={k}>
              <span className="text-ink-mute">{k}</span> {formatQuantity(v, u, 5)}
            </span>
          ))
        ) : (
          <span className="text-ink-faint">move over the plot to read values</span>
        )}
      </div>
      <span className="text-ink-faint">{hint}</span>
    </div>
  );
}

/** Readout items of sample i (null when no sample is under the cursor). */
export function cursorItems(
  t: ArrayLike<number>,
  input: ArrayLike<number>,
  output: ArrayLike<number>,
  i: number | null,
): [string, number, string][] | null {
  if (i == null || i >= t.length) return null;
  return [
    ["t", t[i], "s"],
    ["input", input[i], "V"],
    ["output", output[i], "V"],
  ];
}

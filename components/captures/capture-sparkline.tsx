import { formatQuantity } from "@/lib/design/notation";

/**
 * A quick look at a measured waveform: min/max per pixel column (so spikes survive the
 * thinning), drawn as one SVG path in the input colour. Not the Trace plot; just a preview.
 */
export function CaptureSparkline({
  samples,
  width = 560,
  height = 120,
  label,
}: {
  samples: [number, number][];
  width?: number;
  height?: number;
  label?: string;
}) {
  if (samples.length < 2) return null;
  const t0 = samples[0][0];
  const t1 = samples[samples.length - 1][0];
  let vMin = Infinity;
  let vMax = -Infinity;
  for (const [, v] of samples) {
    if (v < vMin) vMin = v;
    if (v > vMax) vMax = v;
  }
  const span = vMax - vMin || 1;
  const pad = 6;
  const x = (t: number) => pad + ((t - t0) / (t1 - t0 || 1)) * (width - 2 * pad);
  const y = (v: number) => height - pad - ((v - vMin) / span) * (height - 2 * pad);
  const columns = Math.max(2, Math.floor(width - 2 * pad));
  const lo = new Array<number>(columns).fill(Infinity);
  const hi = new Array<number>(columns).fill(-Infinity);
  for (const [t, v] of samples) {
    const c = Math.min(columns - 1, Math.floor(((t - t0) / (t1 - t0 || 1)) * (columns - 1)));
    if (v < lo[c]) lo[c] = v;
    if (v > hi[c]) hi[c] = v;
  }
  let d = "";
  for (let c = 0; c < columns; c++) {
    if (lo[c] === Infinity) continue;
    const px = pad + c;
    d += `${d ? "L" : "M"}${px.toFixed(1)},${y(lo[c]).toFixed(1)}L${px.toFixed(1)},${y(hi[c]).toFixed(1)}`;
  }
  return (
    <figure className="flex flex-col gap-1">
      <svg
        viewBox={`0 0 ${width} ${height}`}
        preserveAspectRatio="none"
        style={{ height }}
        className="w-full rounded border border-paper-line bg-paper-card"
        role="img"
        aria-label={label ?? "Capture preview"}
      >
        <line
          x1={pad}
          x2={width - pad}
          y1={y(0)}
          y2={y(0)}
          stroke="#d9ddd3"
          strokeDasharray="3 3"
          strokeWidth={vMin <= 0 && vMax >= 0 ? 1 : 0}
        />
        <path d={d} fill="none" stroke="#3b4fa8" strokeWidth={1.2} vectorEffect="non-scaling-stroke" />
        <line x1={x(t0)} x2={x(t1)} y1={height - 1} y2={height - 1} stroke="#d9ddd3" />
      </svg>
      <figcaption className="flex justify-between font-mono text-[11px] text-ink-mute">
        <span>
          {formatQuantity(vMin, "V")} … {formatQuantity(vMax, "V")}
        </span>
        <span>
          {samples.length.toLocaleString("en")} points over {formatQuantity(t1 - t0, "s")}
        </span>
      </figcaption>
    </figure>
  );
}

"use client";
// "Signal": the input as a list of waveform components (added, removed, reordered, edited),
// optional seeded noise, the run settings, and a small preview of the summed input.
import { useMemo, useState } from "react";
import type { InputComponent, Scenario } from "@/lib/schemas/scenario";
import { InputSignal, evaluateInputSignal } from "@/lib/sim/signals";
import { formatQuantity } from "@/lib/design/notation";
import { QuantityField } from "./quantity-field";
import { MiniButton, Section, SelectRow } from "./controls";
import { useWb, useWbApi } from "./store";
import { CapturePicker } from "@/components/captures/capture-picker";
import { INPUT_FIELD_LABEL } from "@/lib/workbench/screen-words";

type Kind = InputComponent["kind"];

const KIND_LABEL: Record<Kind, string> = {
  dc: "Steady level",
  sine: "Sine",
  triangle: "Triangle",
  ramp: "Ramp",
  pulse: "Pulse train",
  pwl: "Point list",
  capture: "Capture (uploaded)",
};

function freshComponent(kind: Kind, s: Scenario): InputComponent {
  const mid = s.stage.reference;
  const span = s.supply.positive - s.supply.negative;
  const T = s.run.duration;
  switch (kind) {
    case "dc":
      return { kind, level: mid };
    case "sine":
      return { kind, amplitude: span / 4, frequency: 2 / T, phase: 0, offset: 0 };
    case "triangle":
      return { kind, amplitude: span / 4, frequency: 2 / T, phase: 0, offset: 0 };
    case "ramp":
      return { kind, from: s.supply.negative, to: s.supply.positive, start: 0, duration: T };
    case "pulse":
      return { kind, low: 0, high: span / 10, period: T / 4, duty: 0.5, rise: 0, fall: 0, delay: 0 };
    case "pwl":
      return {
        kind,
        points: [
          [0, mid],
          [T, mid],
        ],
      };
    case "capture":
      return {
        kind,
        samples: [
          [0, 0],
          [T, 0],
        ],
      };
  }
}

const ADDABLE: Kind[] = ["dc", "sine", "triangle", "ramp", "pulse", "pwl"];

export function SignalPanel({ readOnly = false }: { readOnly?: boolean }) {
  const components = useWb((s) => s.draft.input.components);
  const api = useWbApi();
  const addInput = useWb((s) => s.addInput);
  const removeInput = useWb((s) => s.removeInput);
  const moveInput = useWb((s) => s.moveInput);
  // Stable React keys per component (kept in the store): they follow a component when it moves
  // or a neighbour is removed, so its fields keep their own text.
  const ids = useWb((s) => s.inputIds.ids);
  const [adding, setAdding] = useState<Kind>("sine");

  return (
    <div data-testid="signal-panel">
      <InputPreview />
      <Section
        title={`Waveform components (${components.length})`}
        aside={
          readOnly ? null : (
            <span className="flex items-center gap-1">
              <select
                aria-label="Component to add"
                value={adding}
                onChange={(e) => setAdding(e.target.value as Kind)}
                className="h-6 rounded border border-paper-line bg-white px-1 text-[12px]"
              >
                {ADDABLE.map((k) => (
                  <option key={k} value={k}>
                    {KIND_LABEL[k]}
                  </option>
                ))}
              </select>
              <MiniButton
                disabled={components.length >= 64}
                onClick={() => addInput(freshComponent(adding, api.getState().draft))}
              >
                Add
              </MiniButton>
            </span>
          )
        }
      >
        <ol className="space-y-2">
          {components.map((c, i) => (
            <li key={ids[i]} data-row-id={ids[i]} className="rounded border border-paper-line bg-paper/60 px-2 py-1.5">
              <div className="mb-1 flex items-center justify-between gap-2">
                <span className="text-[12.5px] font-medium text-ink">
                  <span className="mr-1.5 font-mono text-ink-faint">{i + 1}</span>
                  {KIND_LABEL[c.kind]}
                </span>
                {readOnly ? null : (
                  <span className="flex gap-1">
                    <MiniButton
                      aria-label={`Move component ${i + 1} up`}
                      disabled={i === 0}
                      onClick={() => moveInput(i, i - 1)}
                    >
                      ↑
                    </MiniButton>
                    <MiniButton
                      aria-label={`Move component ${i + 1} down`}
                      disabled={i === components.length - 1}
                      onClick={() => moveInput(i, i + 1)}
                    >
                      ↓
                    </MiniButton>
                    <MiniButton
                      aria-label={`Remove component ${i + 1}`}
                      disabled={components.length <= 1}
                      title={components.length <= 1 ? "The input needs at least one component" : undefined}
                      onClick={() => removeInput(i)}
                    >
                      Remove
                    </MiniButton>
                  </span>
                )}
              </div>
              <ComponentFields index={i} c={c} readOnly={readOnly} />
            </li>
          ))}
        </ol>
        {readOnly || components.length >= 64 ? null : (
          <div className="mt-2 border-t border-paper-line pt-2">
            <p className="mb-1 text-[12px] text-ink-soft">Add a measured capture (team captures page)</p>
            <CapturePicker onPick={addInput} />
          </div>
        )}
      </Section>
      <NoiseSection readOnly={readOnly} />
      <RunSettingsSection readOnly={readOnly} />
    </div>
  );
}

function ComponentFields({ index, c, readOnly }: { index: number; c: InputComponent; readOnly: boolean }) {
  const edit = useWb((s) => s.edit);
  const set = (key: string) => (v: number) =>
    edit((d) => {
      (d.input.components[index] as unknown as Record<string, number>)[key] = v;
    });
  const q = (key: string, unit: string, value: number | undefined, rule?: (v: number) => string | null) => (
    <QuantityField
      key={key}
      name={`input.${index}.${key}`}
      label={INPUT_FIELD_LABEL[key] ?? key}
      listLabel={`Component ${index + 1} ${INPUT_FIELD_LABEL[key] ?? key}`}
      unit={unit}
      value={value ?? 0}
      onCommit={set(key)}
      validate={rule}
      disabled={readOnly}
    />
  );
  const pos = (v: number) => (v > 0 ? null : "must be above 0");
  const nonNeg = (v: number) => (v >= 0 ? null : "not negative");
  switch (c.kind) {
    case "dc":
      return q("level", "V", c.level);
    case "sine":
    case "triangle":
      return (
        <>
          {q("amplitude", "V", c.amplitude, nonNeg)}
          {q("frequency", "Hz", c.frequency, pos)}
          {q("offset", "V", c.offset)}
          {q("phase", "", c.phase)}
        </>
      );
    case "ramp":
      return (
        <>
          {q("from", "V", c.from)}
          {q("to", "V", c.to)}
          {q("start", "s", c.start, nonNeg)}
          {q("duration", "s", c.duration, nonNeg)}
        </>
      );
    case "pulse":
      return (
        <>
          {q("low", "V", c.low)}
          {q("high", "V", c.high)}
          {q("period", "s", c.period, pos)}
          {q("duty", "", c.duty, (v) => (v >= 0 && v <= 1 ? null : "0 … 1"))}
          {q("rise", "s", c.rise, nonNeg)}
          {q("fall", "s", c.fall, nonNeg)}
          {q("delay", "s", c.delay, nonNeg)}
        </>
      );
    case "pwl":
      // Re-keyed when the points change from outside (restore, new design) so the text follows.
      return (
        <PointList
          key={`${c.points.length}:${c.points[0]?.join()}:${c.points.at(-1)?.join()}`}
          index={index}
          points={c.points}
          readOnly={readOnly}
        />
      );
    case "capture":
      return (
        <p className="text-[12px] text-ink-mute">
          {c.samples.length.toLocaleString("en")} measured samples from {formatQuantity(c.samples[0][0], "s")} to{" "}
          {formatQuantity(c.samples[c.samples.length - 1][0], "s")}. Replace it by uploading a new capture.
        </p>
      );
  }
}

/** Point list as text, one "time value" pair per line (engineering notation allowed). */
function PointList({ index, points, readOnly }: { index: number; points: [number, number][]; readOnly: boolean }) {
  const edit = useWb((s) => s.edit);
  const initial = useMemo(
    () => points.map(([t, v]) => `${formatQuantity(t, "").replace(" ", "")}  ${v}`).join("\n"),
    [points],
  );
  const [text, setText] = useState(initial);
  const [problem, setProblem] = useState<string | null>(null);
  return (
    <div>
      <textarea
        aria-label={`Points of component ${index + 1} (time value per line)`}
        className="h-24 w-full rounded border border-paper-line bg-white px-1.5 py-1 font-mono text-[12px] outline-none focus:border-indigo"
        value={text}
        readOnly={readOnly}
        spellCheck={false}
        onChange={(e) => setText(e.target.value)}
        onBlur={async () => {
          const { parseQuantity } = await import("@/lib/design/notation");
          const pts: [number, number][] = [];
          const lines = text
            .split(/\n/)
            .map((l) => l.trim())
            .filter(Boolean);
          for (const [n, line] of lines.entries()) {
            const [a, b] = line.split(/[\s,;]+/);
            const t = parseQuantity(a ?? "");
            const v = parseQuantity(b ?? "");
            if (t === null || v === null) return setProblem(`line ${n + 1}: needs "time value"`);
            if (pts.length && t < pts[pts.length - 1][0]) return setProblem(`line ${n + 1}: time goes backwards`);
            pts.push([t, v]);
          }
          if (!pts.length) return setProblem("at least one point");
          setProblem(null);
          edit((d) => {
            const c = d.input.components[index];
            if (c.kind === "pwl") c.points = pts;
          });
        }}
      />
      <p className={`text-[11.5px] ${problem ? "text-alert" : "text-ink-faint"}`}>
        {problem ?? `${points.length} points · applied when you leave the box`}
      </p>
    </div>
  );
}

function NoiseSection({ readOnly }: { readOnly: boolean }) {
  const noise = useWb((s) => s.draft.input.noise);
  const edit = useWb((s) => s.edit);
  return (
    <Section
      title="Noise"
      aside={
        <label className="flex items-center gap-1.5 text-[12px] text-ink-soft">
          <input
            type="checkbox"
            checked={!!noise}
            disabled={readOnly}
            onChange={(e) =>
              edit((d) => {
                if (e.target.checked)
                  d.input.noise = { rms: 0.005, bandwidth: Math.max(10, 200 / d.run.duration), seed: 1 };
                else delete d.input.noise;
              })
            }
          />
          add Gaussian noise
        </label>
      }
    >
      {noise ? (
        <>
          <QuantityField
            name="noise.rms"
            label="rms"
            unit="V"
            value={noise.rms}
            disabled={readOnly}
            validate={(v) => (v >= 0 ? null : "not negative")}
            onCommit={(v) => edit((d) => void (d.input.noise && (d.input.noise.rms = v)))}
          />
          <QuantityField
            name="noise.bandwidth"
            label="Bandwidth"
            unit="Hz"
            value={noise.bandwidth}
            disabled={readOnly}
            validate={(v) => (v > 0 ? null : "must be above 0")}
            onCommit={(v) => edit((d) => void (d.input.noise && (d.input.noise.bandwidth = v)))}
          />
          <div className="flex items-center gap-2">
            <div className="min-w-0 flex-1">
              <QuantityField
                name="noise.seed"
                label="Seed"
                unit=""
                plain
                value={noise.seed}
                disabled={readOnly}
                validate={(v) => (Number.isInteger(v) && v >= 0 && v <= 4294967295 ? null : "whole number, 32 bits")}
                onCommit={(v) => edit((d) => void (d.input.noise && (d.input.noise.seed = v)))}
              />
            </div>
            {readOnly ? null : (
              <MiniButton
                title="Draw a new seed: a fresh, repeatable noise sequence"
                onClick={() => {
                  const seed = crypto.getRandomValues(new Uint32Array(1))[0];
                  edit((d) => void (d.input.noise && (d.input.noise.seed = seed)));
                }}
              >
                New seed
              </MiniButton>
            )}
          </div>
          <p className="ml-[8rem] text-[11.5px] text-ink-mute">
            Deadband should exceed 6.6 × rms = {formatQuantity(6.6 * noise.rms, "V")} (peak-to-peak of 99.9 % of
            samples).
          </p>
        </>
      ) : (
        <p className="text-[12px] text-ink-mute">No noise: the input is exactly the sum above.</p>
      )}
    </Section>
  );
}

function RunSettingsSection({ readOnly }: { readOnly: boolean }) {
  const run = useWb((s) => s.draft.run);
  const edit = useWb((s) => s.edit);
  return (
    <Section title="Run settings">
      <QuantityField
        name="run.duration"
        label="Duration"
        unit="s"
        value={run.duration}
        disabled={readOnly}
        validate={(v) => (v > 0 && v <= 1e6 ? null : "0 … 1e6 s")}
        onCommit={(v) => edit((d) => void (d.run.duration = v))}
      />
      <QuantityField
        name="run.points"
        label="Output points"
        unit="samples"
        plain
        value={run.points}
        disabled={readOnly}
        validate={(v) => (Number.isInteger(v) && v >= 2 && v <= 2_000_000 ? null : "whole number 2 … 2,000,000")}
        onCommit={(v) => edit((d) => void (d.run.points = v))}
      />
      <SelectRow
        label="Output starts"
        name="run.initialOutput"
        value={run.initialOutput}
        disabled={readOnly}
        onChange={(e) => edit((d) => void (d.run.initialOutput = e.target.value as "low" | "high"))}
      >
        <option value="low">low</option>
        <option value="high">high</option>
      </SelectRow>
      <QuantityField
        name="run.holdOff"
        label="Chatter hold-off"
        unit="s"
        value={run.holdOff}
        placeholder="auto"
        disabled={readOnly}
        validate={(v) => (v > 0 ? null : "must be above 0")}
        onClear={() => edit((d) => void delete d.run.holdOff)}
        onCommit={(v) => edit((d) => void (d.run.holdOff = v))}
      />
      <SelectRow
        label="Solver"
        name="run.solver"
        value={run.solver ?? "exact"}
        disabled={readOnly}
        onChange={(e) => edit((d) => void (d.run.solver = e.target.value as "exact" | "odex"))}
      >
        <option value="exact">exact piecewise (default, stiff-safe)</option>
        <option value="odex">odex extrapolation (cross-check)</option>
      </SelectRow>
    </Section>
  );
}

const PREVIEW_POINTS = 480;

function inside0(v: number, p: { v: Float64Array | null; band: number }): boolean {
  if (!p.v) return false;
  let a = Infinity;
  let b = -Infinity;
  for (const x of p.v) {
    a = Math.min(a, x - p.band);
    b = Math.max(b, x + p.band);
  }
  return v >= a && v <= b;
}
/** Above this many noise segments the preview draws the noise as a ±3σ band instead of computing it. */
const PREVIEW_NOISE_LIMIT = 20_000;

/** The summed input over the run, 480 samples as an SVG line (noise drawn, or banded when dense). */
function InputPreview() {
  const input = useWb((s) => s.draft.input);
  const run = useWb((s) => s.draft.run);
  const supply = useWb((s) => s.draft.supply);
  const stage = useWb((s) => s.draft.stage);
  const draft = useWb((s) => s.draft);
  // biome-ignore lint/correctness/useExhaustiveDependencies: only the input and the duration shape the preview; other edits must not re-evaluate it
  const preview = useMemo(() => {
    const t = new Float64Array(PREVIEW_POINTS);
    for (let i = 0; i < PREVIEW_POINTS; i++) t[i] = (run.duration * i) / (PREVIEW_POINTS - 1);
    const noise = input.noise;
    // A million noise knots would block the page; the run itself happens in the worker.
    const banded = !!noise && 2 * noise.bandwidth * run.duration > PREVIEW_NOISE_LIMIT;
    const source = banded ? { ...draft, input: { components: input.components } } : draft;
    try {
      return {
        t,
        v: evaluateInputSignal(new InputSignal(source, run.duration), t),
        band: banded ? 3 * noise!.rms : 0,
        error: null as string | null,
      };
    } catch (e) {
      return { t, v: null, band: 0, error: e instanceof Error ? e.message : String(e) };
    }
    // Only the input and the duration shape the preview; other edits must not re-evaluate it.
  }, [input, run.duration]);

  const W = 400;
  const H = 84;
  let body: React.ReactNode = null;
  let range = "";
  if (preview.v) {
    let vMin = Infinity;
    let vMax = -Infinity;
    for (const x of preview.v) {
      vMin = Math.min(vMin, x - preview.band);
      vMax = Math.max(vMax, x + preview.band);
    }
    // Scale to the signal itself (a 0.2 V ramp must not look flat against 5 V rails); rails and
    // reference are drawn only where they fall inside that window.
    const pad = Math.max(0.08 * (vMax - vMin), 1e-3);
    const lo = vMin - pad;
    const hi = vMax + pad;
    const y = (v: number) => H - 4 - ((v - lo) / (hi - lo || 1)) * (H - 8);
    const x = (i: number) => ((i / (PREVIEW_POINTS - 1)) * W).toFixed(1);
    const pts = Array.from(preview.v, (v, i) => `${x(i)},${y(v).toFixed(1)}`).join(" ");
    const band = preview.band
      ? Array.from(preview.v, (v, i) => `${x(i)},${y(v + preview.band).toFixed(1)}`)
          .concat(Array.from(preview.v, (v, i) => `${x(i)},${y(v - preview.band).toFixed(1)}`).reverse())
          .join(" ")
      : null;
    const inside = (v: number) => v > lo && v < hi;
    range = `${formatQuantity(vMin, "V")} … ${formatQuantity(vMax, "V")}`;
    body = (
      <>
        {[supply.positive, supply.negative].filter(inside).map((v) => (
          <line key={v} x1={0} x2={W} y1={y(v)} y2={y(v)} stroke="#9aa3b2" strokeDasharray="2 3" />
        ))}
        {inside(stage.reference) ? (
          <line
            x1={0}
            x2={W}
            y1={y(stage.reference)}
            y2={y(stage.reference)}
            stroke="#4d7a3a"
            strokeDasharray="5 3"
            strokeOpacity={0.7}
          />
        ) : null}
        {band ? <polygon points={band} fill="#3b4fa8" fillOpacity={0.14} stroke="none" /> : null}
        <polyline points={pts} fill="none" stroke="#3b4fa8" strokeWidth={1.3} vectorEffect="non-scaling-stroke" />
      </>
    );
  }
  return (
    <div className="border-b border-paper-line bg-white px-3 py-2" data-testid="input-preview">
      <div className="mb-1 flex items-baseline justify-between text-[11.5px]">
        <span className="font-semibold uppercase tracking-wider text-ink-mute">Input preview</span>
        <span className="font-mono text-ink-mute">
          {preview.error ? "" : `${range} over ${formatQuantity(run.duration, "s")}`}
        </span>
      </div>
      {preview.error ? (
        <p className="text-[12px] text-alert">Cannot draw the input: {preview.error}</p>
      ) : (
        <svg
          viewBox={`0 0 ${W} ${H}`}
          preserveAspectRatio="none"
          className="block h-[84px] w-full rounded bg-paper/50"
          aria-label="Input preview"
        >
          {body}
        </svg>
      )}
      <p className="mt-0.5 text-[11px] text-ink-faint">
        scaled to the signal · green dash: reference{inside0(stage.reference, preview) ? "" : " (off scale)"}
        {preview.band ? " · shaded: ±3σ of the noise (too dense to draw here; the run computes every segment)" : ""}
      </p>
    </div>
  );
}

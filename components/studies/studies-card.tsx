"use client";
// "Noise margin study" and "Tolerance spread" on the Workbench: a form each, run in the study
// worker pool (one worker per core, progress over the whole study, Cancel stops every worker),
// the answer as a chart and a number, and "Save with a new run" so reviewers can open it by link.
import { errorMessage } from "@/lib/client/fetcher";
import Link from "next/link";
import { memo, useCallback, useEffect, useMemo, useReducer, useRef, useState, useSyncExternalStore } from "react";
import { Card } from "@/components/ui/card";
import { Button } from "@/components/ui/button";
import { Section, SelectRow, Tabs } from "@/components/workbench/controls";
import { QuantityField } from "@/components/workbench/quantity-field";
import { runStudyInPool, StudyCancelled, defaultPoolSize } from "@/lib/client/study-pool";
import type { Scenario } from "@/lib/schemas/scenario";
import { estimateCaptureNoise, type CaptureNoiseEstimate } from "@/lib/studies/capture-noise";
import { studyCorners } from "@/lib/studies/corners";
import { summarizeNoiseMargin, type NoiseTaskOutput } from "@/lib/studies/noise-margin";
import {
  noiseMarginConfigSchema,
  toleranceSpreadConfigSchema,
  type DrawOutput,
  type Measure,
  type NoiseMarginConfig,
  type StudyUpload,
  type ToleranceSpreadConfig,
} from "@/lib/schemas/study";
import { summarizeToleranceSpread } from "@/lib/studies/tolerance-spread";
import {
  initialStudiesState,
  studiesReducer,
  studiesStale,
  studySaveBlocked,
  type StudyTab,
} from "@/lib/workbench/studies-state";
import {
  inputRange,
  MEASURE_LABEL,
  MEASURE_UNIT,
  STUDY_FIELD_LABEL,
  studyIssueText,
  studyRule,
  SUGGESTED_WINDOW,
  suggestNoise,
  suggestTolerance,
} from "@/lib/workbench/study-suggest";
import { NoiseMarginResult, ToleranceSpreadResult, fmtV } from "./study-readouts";

export interface StudiesCardProps {
  /** The scenario to study (already parsed); null while the editor holds an invalid draft. */
  scenario: Scenario | null;
  /** Changes whenever the scenario does (the workbench's draft revision): a study of an older one is out of date. */
  revision: number;
  /** Why saving is not possible right now (unsaved edits, role), or null. */
  saveBlocked: string | null;
  /** Create a run of the saved scenario and store the study with it; resolves to the run id. */
  onSave: (upload: StudyUpload) => Promise<string>;
  /** Asked before a study runs; false stops it (the workbench refuses while fields are invalid). */
  beforeRun?: () => boolean;
}

function captureOf(s: Scenario) {
  for (const c of s.input.components) if (c.kind === "capture") return c.samples;
  return null;
}

/** Progress lives outside React state: only the bar re-renders, never the forms and charts. */
function createProgress() {
  let value = { done: 0, total: 0 };
  const subs = new Set<() => void>();
  return {
    get: () => value,
    set: (v: { done: number; total: number }) => {
      value = v;
      subs.forEach((f) => f());
    },
    subscribe: (f: () => void) => {
      subs.add(f);
      return () => void subs.delete(f);
    },
  };
}
type ProgressStore = ReturnType<typeof createProgress>;

function StudyProgress({ store, onCancel }: { store: ProgressStore; onCancel: () => void }) {
  const progress = useSyncExternalStore(store.subscribe, store.get, store.get);
  const pct = progress.total ? Math.round((100 * progress.done) / progress.total) : 0;
  return (
    <div className="mb-3 flex items-center gap-2" data-testid="study-progress">
      <div
        className="h-1.5 flex-1 overflow-hidden rounded-full bg-paper-sunk"
        role="progressbar"
        aria-label="Study progress"
        aria-valuemin={0}
        aria-valuemax={100}
        aria-valuenow={pct}
      >
        <div className="h-full rounded-full bg-copper" style={{ width: `${pct}%` }} />
      </div>
      <span className="font-mono text-[12px] text-ink-mute">
        {progress.done.toLocaleString("en")} / {progress.total.toLocaleString("en")} runs · {defaultPoolSize()} workers
      </span>
      <Button size="sm" variant="secondary" onClick={onCancel} data-testid="cancel-study-button">
        Cancel
      </Button>
    </div>
  );
}

const NoiseResultMemo = memo(NoiseMarginResult);
const ToleranceResultMemo = memo(ToleranceSpreadResult);

export function StudiesCard({ scenario, revision, saveBlocked, onSave, beforeRun }: StudiesCardProps) {
  const [state, dispatch] = useReducer(studiesReducer, initialStudiesState);
  const { tab, noise, tolerance, running, error, saved, saving } = state;
  const [progress] = useState(createProgress);
  const abort = useRef<AbortController | null>(null);
  const started = useRef(0);

  // Leaving the page stops a running study: no worker outlives the Workbench.
  useEffect(() => () => abort.current?.abort(), []);

  const capture = useMemo(() => {
    const samples = scenario ? captureOf(scenario) : null;
    if (!samples) return null;
    try {
      return estimateCaptureNoise(samples);
    } catch {
      return null;
    }
  }, [scenario]);

  // Stable callbacks for the memoised forms; they call the latest `run`.
  const runRef = useRef<(which: StudyTab, config: NoiseMarginConfig | ToleranceSpreadConfig) => Promise<void>>(
    async () => {},
  );
  const runNoise = useCallback((c: NoiseMarginConfig) => void runRef.current("noise", c), []);
  const runTolerance = useCallback((c: ToleranceSpreadConfig) => void runRef.current("tolerance", c), []);

  async function run(which: StudyTab, config: NoiseMarginConfig | ToleranceSpreadConfig) {
    if (!scenario) return;
    if (beforeRun && !beforeRun()) return;
    dispatch({ type: "started", which });
    progress.set({ done: 0, total: 0 });
    const ac = new AbortController();
    abort.current = ac;
    started.current = performance.now();
    const on = revision;
    try {
      // Progress repaints at most ~8 times a second: the main thread stays free for the user.
      let last = 0;
      const onProgress = (p: { done: number; total: number }) => {
        const now = performance.now();
        if (now - last < 120 && p.done < p.total) return;
        last = now;
        progress.set(p);
      };
      const out = await runStudyInPool({ scenario, config }, { signal: ac.signal, onProgress });
      if (config.kind === "noise-margin") {
        const tasks = out.tasks as NoiseTaskOutput[];
        dispatch({
          type: "noiseDone",
          done: {
            on,
            config,
            tasks,
            summary: summarizeNoiseMargin(config, tasks),
            wallMs: out.wallMs,
            workers: out.workers,
          },
        });
      } else {
        const tasks = out.tasks as DrawOutput[];
        dispatch({
          type: "toleranceDone",
          done: {
            on,
            config,
            tasks,
            summary: summarizeToleranceSpread(config, tasks, studyCorners(scenario, config)),
            wallMs: out.wallMs,
            workers: out.workers,
          },
        });
      }
    } catch (e) {
      dispatch({
        type: "failed",
        message:
          e instanceof StudyCancelled
            ? "Study cancelled; every worker was stopped."
            : `Study failed — ${errorMessage(e)}`,
      });
    } finally {
      dispatch({ type: "stopped" });
      abort.current = null;
    }
  }

  runRef.current = run;

  const save = async () => {
    const upload: StudyUpload = { schema: "railwise.study/1" };
    if (noise)
      upload.noiseMargin = { config: noise.config, tasks: noise.tasks, wallMs: noise.wallMs, workers: noise.workers };
    if (tolerance)
      upload.toleranceSpread = {
        config: tolerance.config,
        tasks: tolerance.tasks,
        wallMs: tolerance.wallMs,
        workers: tolerance.workers,
      };
    dispatch({ type: "saveStarted" });
    try {
      dispatch({ type: "saved", runId: await onSave(upload) });
    } catch (e) {
      dispatch({ type: "saveFailed", message: `Not saved — ${errorMessage(e)}` });
    }
  };

  const blocked = studySaveBlocked(state, revision, saveBlocked);
  const none = !(noise || tolerance);
  return (
    <Card
      title="Studies"
      description="Will the deadband hold against real noise? Do the thresholds hold over part tolerances?"
      padded={false}
      className="min-w-0"
      actions={
        <span className="flex flex-wrap items-center gap-2">
          {blocked ? (
            <span
              className={`text-[12px] ${none || running ? "text-ink-mute" : "text-caution"}`}
              data-testid="study-save-blocked"
              data-stale={studiesStale(state, revision) || undefined}
            >
              {blocked}
            </span>
          ) : null}
          <Button
            size="sm"
            variant="primary"
            disabled={!!blocked || saving}
            onClick={() => void save()}
            data-testid="save-study-button"
          >
            {saving ? "Saving…" : "Save with a new run"}
          </Button>
        </span>
      }
    >
      <div data-testid="studies-card">
        <Tabs<StudyTab>
          label="Studies"
          value={tab}
          onChange={(t) => dispatch({ type: "tab", tab: t })}
          tabs={[
            { id: "noise", label: "Noise margin study" },
            { id: "tolerance", label: "Tolerance spread" },
          ]}
        />
        {!scenario ? (
          <p className="px-4 py-3 text-[13px] text-alert">
            Fix the scenario's fields first: a study needs a valid scenario.
          </p>
        ) : (
          <div className="grid min-w-0 gap-0 lg:grid-cols-[340px_minmax(0,1fr)]">
            <div className="border-b border-paper-line lg:border-b-0 lg:border-r">
              {tab === "noise" ? (
                <NoiseFormMemo
                  key={`n-${scenario.stage.kind}`}
                  scenario={scenario}
                  capture={capture}
                  busy={!!running}
                  onRun={runNoise}
                />
              ) : (
                <ToleranceFormMemo
                  key={`t-${scenario.stage.kind}`}
                  scenario={scenario}
                  busy={!!running}
                  onRun={runTolerance}
                />
              )}
            </div>
            <div className="min-w-0 p-3">
              {running ? <StudyProgress store={progress} onCancel={() => abort.current?.abort()} /> : null}
              {error ? (
                <p className="mb-2 text-[13px] text-alert" role="alert" data-testid="study-error">
                  {error}
                </p>
              ) : null}
              {saved ? (
                <p
                  className="mb-2 rounded border-l-[3px] border-moss bg-moss-soft/70 px-2 py-1 text-[13px]"
                  role="status"
                  data-testid="study-saved"
                >
                  Study saved with a new run.{" "}
                  <Link
                    href={`/runs/${saved.runId}`}
                    className="font-medium text-copper-deep underline"
                    data-testid="study-run-link"
                  >
                    Open the run
                  </Link>
                </p>
              ) : null}
              {tab === "noise" ? (
                noise ? (
                  <NoiseResultMemo
                    summary={noise.summary}
                    meta={`${noise.tasks.length.toLocaleString("en")} runs in ${(noise.wallMs / 1000).toFixed(2)} s on ${noise.workers} workers.`}
                  />
                ) : (
                  <Idle text="Sweeps the noise rms on this scenario's input, many seeds per level, and counts how often the output switches more often than it does without noise." />
                )
              ) : tolerance ? (
                <ToleranceResultMemo
                  summary={tolerance.summary}
                  meta={`${tolerance.tasks.length.toLocaleString("en")} runs in ${(tolerance.wallMs / 1000).toFixed(2)} s on ${tolerance.workers} workers.`}
                />
              ) : (
                <Idle text="Draws resistor values, input offset and output headroom within tolerance, simulates each draw, and measures where it switches." />
              )}
            </div>
          </div>
        )}
      </div>
    </Card>
  );
}

function Idle({ text }: { text: string }) {
  return <p className="py-6 text-center text-[13px] text-ink-mute">{text}</p>;
}

function NoiseForm({
  scenario,
  capture,
  busy,
  onRun,
}: {
  scenario: Scenario;
  capture: CaptureNoiseEstimate | null;
  busy: boolean;
  onRun: (c: NoiseMarginConfig) => void;
}) {
  const [f, setF] = useState(() => suggestNoise(scenario, capture));
  const [useCapture, setUseCapture] = useState(!!capture);
  const set = (patch: Partial<typeof f>) => setF((o) => ({ ...o, ...patch }));
  const parsed = noiseMarginConfigSchema.safeParse({
    kind: "noise-margin",
    seed: f.seed,
    rmsFrom: f.rmsFrom,
    rmsTo: f.rmsTo,
    levels: f.levels,
    seedsPerLevel: f.seedsPerLevel,
    bandwidth: f.bandwidth,
    limit: f.limit,
    measured:
      useCapture && capture
        ? { rms: capture.modelRms, bandwidth: capture.bandwidth, label: "capture noise" }
        : undefined,
  });
  return (
    <form
      onSubmit={(e) => {
        e.preventDefault();
        if (parsed.success) onRun(parsed.data);
      }}
      data-testid="noise-form"
    >
      <Section title="Sweep">
        <QuantityField
          name="noise-rms-from"
          label={STUDY_FIELD_LABEL.rmsFrom}
          validate={(v) => studyRule("rmsFrom", v)}
          unit="V"
          value={f.rmsFrom}
          onCommit={(v) => set({ rmsFrom: v })}
        />
        <QuantityField
          name="noise-rms-to"
          label={STUDY_FIELD_LABEL.rmsTo}
          validate={(v) => studyRule("rmsTo", v)}
          unit="V"
          value={f.rmsTo}
          onCommit={(v) => set({ rmsTo: v })}
        />
        <QuantityField
          name="noise-levels"
          label={STUDY_FIELD_LABEL.levels}
          validate={(v) => studyRule("levels", v)}
          unit=""
          plain
          value={f.levels}
          onCommit={(v) => set({ levels: Math.round(v) })}
        />
        <QuantityField
          name="noise-seeds"
          label={STUDY_FIELD_LABEL.seedsPerLevel}
          validate={(v) => studyRule("seedsPerLevel", v)}
          unit=""
          plain
          value={f.seedsPerLevel}
          onCommit={(v) => set({ seedsPerLevel: Math.round(v) })}
        />
        <QuantityField
          name="noise-bandwidth"
          label={STUDY_FIELD_LABEL.bandwidth}
          validate={(v) => studyRule("bandwidth", v)}
          unit="Hz"
          value={f.bandwidth}
          onCommit={(v) => set({ bandwidth: v })}
        />
        <QuantityField
          name="noise-limit"
          label={STUDY_FIELD_LABEL.limit}
          validate={(v) => studyRule("limit", v)}
          unit="%"
          plain
          value={f.limit * 100}
          onCommit={(v) => set({ limit: v / 100 })}
        />
        <QuantityField
          name="noise-seed"
          label={STUDY_FIELD_LABEL.seed}
          validate={(v) => studyRule("seed", v)}
          unit=""
          plain
          value={f.seed}
          onCommit={(v) => set({ seed: Math.round(v) })}
        />
      </Section>
      <Section title="Measured noise">
        {capture ? (
          <label className="flex items-start gap-2 text-[12.5px] text-ink-soft">
            <input
              type="checkbox"
              className="mt-0.5"
              checked={useCapture}
              onChange={(e) => setUseCapture(e.target.checked)}
              data-testid="use-capture-noise"
            />
            <span>
              Mark the capture's noise: <span className="font-mono text-ink">{fmtV(capture.modelRms)}</span> rms,{" "}
              <span className="font-mono text-ink">{Math.round(capture.bandwidth)} Hz</span>
              {capture.limitedBySampling ? " (at the capture's own sampling limit: the real noise may be wider)" : ""}.{" "}
              <button
                type="button"
                className="text-copper-deep underline"
                onClick={() => set({ bandwidth: capture.bandwidth })}
              >
                Use its bandwidth
              </button>
            </span>
          </label>
        ) : (
          <p className="text-[12px] text-ink-mute">
            Add a capture to the Signal to estimate its noise (detrended residual rms; bandwidth from its zero-crossing
            rate).
          </p>
        )}
      </Section>
      <div className="flex items-center justify-between gap-2 px-3 pb-3">
        <span className="text-[12px] text-ink-mute">
          {parsed.success ? (
            `${(1 + f.levels * f.seedsPerLevel).toLocaleString("en")} runs`
          ) : (
            <span className="text-alert" data-testid="study-form-problem">
              {studyIssueText(parsed.error.issues)}
            </span>
          )}
        </span>
        <Button
          type="submit"
          size="sm"
          variant="primary"
          disabled={busy || !parsed.success}
          data-testid="run-noise-study"
        >
          Run study
        </Button>
      </div>
    </form>
  );
}

const NoiseFormMemo = memo(NoiseForm);
const ToleranceFormMemo = memo(ToleranceForm);

function ToleranceForm({
  scenario,
  busy,
  onRun,
}: {
  scenario: Scenario;
  busy: boolean;
  onRun: (c: ToleranceSpreadConfig) => void;
}) {
  const [f, setF] = useState(() => suggestTolerance(scenario));
  const set = (patch: Partial<typeof f>) => setF((o) => ({ ...o, ...patch }));
  const [probeLo, probeHi] = useMemo(() => inputRange(scenario), [scenario]);
  const parsed = toleranceSpreadConfigSchema.safeParse({
    kind: "tolerance-spread",
    seed: f.seed,
    draws: f.draws,
    resistorTolerance: f.resistorTolerance,
    offsetTolerance: f.offsetTolerance,
    headroomSpread: f.headroomSpread,
    distribution: f.distribution,
    probe: f.probe === "triangle" ? { kind: "triangle", low: probeLo, high: probeHi } : { kind: "scenario" },
    measures: f.measures,
    window: f.window,
  });
  const setWindow = (m: Measure, i: 0 | 1, v: number) =>
    setF((o) => {
      const w = [...(o.window[m] ?? [v, v])] as [number, number];
      w[i] = v;
      return { ...o, window: { ...o.window, [m]: w } };
    });
  return (
    <form
      onSubmit={(e) => {
        e.preventDefault();
        if (parsed.success) onRun(parsed.data);
      }}
      data-testid="tolerance-form"
    >
      <Section title="Draws">
        <QuantityField
          name="tol-draws"
          label={STUDY_FIELD_LABEL.draws}
          validate={(v) => studyRule("draws", v)}
          unit=""
          plain
          value={f.draws}
          onCommit={(v) => set({ draws: Math.round(v) })}
        />
        <QuantityField
          name="tol-resistors"
          label={STUDY_FIELD_LABEL.resistorTolerance}
          validate={(v) => studyRule("resistorTolerance", v)}
          unit="%"
          plain
          value={f.resistorTolerance * 100}
          onCommit={(v) => set({ resistorTolerance: v / 100 })}
        />
        <QuantityField
          name="tol-offset"
          label={STUDY_FIELD_LABEL.offsetTolerance}
          validate={(v) => studyRule("offsetTolerance", v)}
          unit="V"
          value={f.offsetTolerance}
          onCommit={(v) => set({ offsetTolerance: v })}
        />
        <QuantityField
          name="tol-headroom"
          label={STUDY_FIELD_LABEL.headroomSpread}
          validate={(v) => studyRule("headroomSpread", v)}
          unit="%"
          plain
          value={f.headroomSpread * 100}
          onCommit={(v) => set({ headroomSpread: v / 100 })}
        />
        <SelectRow
          label="distribution"
          value={f.distribution}
          onChange={(e) => set({ distribution: e.target.value as "uniform" | "normal" })}
        >
          <option value="uniform">uniform within tolerance</option>
          <option value="normal">normal, tolerance = 3σ</option>
        </SelectRow>
        <SelectRow
          label="input"
          value={f.probe}
          onChange={(e) => set({ probe: e.target.value as "scenario" | "triangle" })}
        >
          <option value="scenario">scenario's, no noise</option>
          <option value="triangle">
            triangle {fmtV(probeLo)} … {fmtV(probeHi)}
          </option>
        </SelectRow>
        <QuantityField
          name="tol-seed"
          label={STUDY_FIELD_LABEL.seed}
          validate={(v) => studyRule("seed", v)}
          unit=""
          plain
          value={f.seed}
          onCommit={(v) => set({ seed: Math.round(v) })}
        />
      </Section>
      <Section title="Spec window">
        <p className="pb-1 text-[12px] text-ink-mute" data-testid="spec-window-source">
          Starts at ±{SUGGESTED_WINDOW * 100} % around each figure designed from this stage's parts (a suggestion, not
          your spec): enter your own limits.
        </p>
        {f.measures.map((m) => (
          <div key={m}>
            <QuantityField
              name={`win-${m}-min`}
              label={`${MEASURE_LABEL[m]} min`}
              unit={MEASURE_UNIT[m]}
              value={f.window[m]?.[0]}
              onCommit={(v) => setWindow(m, 0, v)}
            />
            <QuantityField
              name={`win-${m}-max`}
              label={`${MEASURE_LABEL[m]} max`}
              unit={MEASURE_UNIT[m]}
              value={f.window[m]?.[1]}
              validate={(v) => {
                const lo = f.window[m]?.[0];
                return lo === undefined || v > lo ? null : `must be above “${MEASURE_LABEL[m]} min”`;
              }}
              onCommit={(v) => setWindow(m, 1, v)}
            />
          </div>
        ))}
      </Section>
      <div className="flex items-center justify-between gap-2 px-3 pb-3">
        <span className="text-[12px] text-ink-mute">
          {parsed.success ? (
            `${(1 + f.draws).toLocaleString("en")} runs`
          ) : (
            <span className="text-alert" data-testid="study-form-problem">
              {studyIssueText(parsed.error.issues)}
            </span>
          )}
        </span>
        <Button
          type="submit"
          size="sm"
          variant="primary"
          disabled={busy || !parsed.success}
          data-testid="run-tolerance-study"
        >
          Run spread
        </Button>
      </div>
    </form>
  );
}

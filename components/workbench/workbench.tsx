"use client";
// The Workbench: the scenario screen for owners and designers. Left, the editor tabs (Stage,
// Signal, From spec); right, the latest run (Trace, Loop, Readings); below, History and Runs.
import Link from "next/link";
import { useEffect, useMemo, useState } from "react";
import { useSWRConfig } from "swr";
import { downloadSamplesCsv } from "@/components/plots/export";
import { extraSampleColumns } from "@/lib/workbench/source-readings";
import { LoadGate } from "@/components/ui/load-state";
import { Badge } from "@/components/ui/badge";
import { Button, buttonClasses } from "@/components/ui/button";
import { SafetyCaution } from "@/components/safety-caution";
import { ScenarioHeading } from "@/components/scenario/scenario-read-view";
import { HttpError, errorMessage } from "@/lib/client/fetcher";
import { runsKey, useBoard, useScenario, type ScenarioRecord } from "@/lib/client/hooks";
import { parseScenario, scenarioSchema, type Scenario } from "@/lib/schemas/scenario";
import { scenarioIssuesText } from "@/lib/workbench/screen-words";
import { saveRun, saveScenario, scenarioKey, versionsKey } from "./api";
import { Tabs } from "./controls";
import { FromSpecPanel } from "./from-spec-panel";
import { HistoryCard, RunsCard } from "./history-runs";
import { LoopCard, ReadingsCard, TraceCard, slug } from "./result-panels";
import { SignalPanel } from "./signal-panel";
import { StagePanel } from "./stage-panel";
import { WorkbenchProvider, useBank, useWb, useWbApi, type FieldProblem, type SideTab } from "./store";
import { useRunner } from "./use-runner";
import { FieldScopeProvider, refuseIfInvalid } from "./field-problems";
import { clearDraft, readDraft, writeDraft, type StoredDraft } from "@/lib/workbench/drafts";
import { WorkbenchStudies } from "@/components/studies/workbench-studies";

/** Loads the scenario and mounts one workbench store for it. */
export function ScenarioWorkbench({ scenarioId }: { scenarioId: string }) {
  const { data, error, isLoading, mutate } = useScenario(scenarioId);
  return (
    <LoadGate
      notFoundTitle="Scenario not found"
      rows={8}
      data={data}
      error={error}
      isLoading={isLoading}
      onRetry={() => void mutate()}
    >
      {(record) => <LoadedWorkbench record={record} />}
    </LoadGate>
  );
}

function LoadedWorkbench({ record }: { record: ScenarioRecord }) {
  // biome-ignore lint/correctness/useExhaustiveDependencies: the store is created once per mount; later SWR refreshes must not reset the editor
  const init = useMemo(() => {
    const parsed = scenarioSchema.safeParse(record.scenario);
    return {
      scenarioId: record.id,
      version: record.version,
      scenario: parsed.success ? parsed.data : (record.scenario as Scenario),
    };
    // The store is created once per mount; later SWR refreshes must not reset the editor.
  }, [record.id]);
  return (
    <WorkbenchProvider init={init}>
      <WorkbenchBody record={record} />
    </WorkbenchProvider>
  );
}

function WorkbenchBody({ record }: { record: ScenarioRecord }) {
  const board = useBoard(record.boardId);
  const tab = useWb((s) => s.tab);
  const setTab = useWb((s) => s.setTab);
  const name = useWb((s) => s.draft.name);
  return (
    // The page marks itself wide (app/(app)/scenarios/[id]/page.tsx): the app column, header
    // included, then spans the window up to 1840 px, so this fills its parent.
    <div data-testid="workbench">
      <ScenarioHeading
        record={{ ...record, version: useWb((s) => s.version) }}
        boardName={board.data?.name}
        actions={<SummaryLink id={record.id} />}
      />
      <SafetyCaution texts={[record.name, name]} className="mb-3" />
      <DraftKeeper record={record} />
      <RunBar />
      <Notice />
      <div className="mt-3 grid gap-3 lg:grid-cols-[minmax(360px,420px)_minmax(0,1fr)] 2xl:grid-cols-[440px_minmax(0,1fr)]">
        <section
          className="min-w-0 self-start rounded-lg border border-paper-line bg-paper-card lg:sticky lg:top-3"
          aria-label="Editor"
        >
          <Tabs<SideTab>
            label="Editor"
            value={tab}
            onChange={setTab}
            tabs={[
              { id: "stage", label: "Stage" },
              { id: "signal", label: "Signal" },
              { id: "spec", label: "From spec" },
            ]}
          />
          <EditorTab />
        </section>
        <div className="grid min-w-0 content-start gap-3">
          <TraceCard />
          <div className="grid min-w-0 gap-3 xl:grid-cols-[minmax(0,1.15fr)_minmax(320px,1fr)]">
            <LoopCard />
            <ReadingsCard />
          </div>
          {/* Below the fold: skip layout and paint of these until scrolled to (a run re-lays the page out). */}
          <div className="min-w-0 [contain-intrinsic-size:auto_700px] [content-visibility:auto]">
            <StudiesScope />
          </div>
          <div className="grid min-w-0 gap-3 [contain-intrinsic-size:auto_360px] [content-visibility:auto] xl:grid-cols-2">
            <RunsCard action={<SaveRunControl />} />
            <HistoryCard canEdit />
          </div>
        </div>
      </div>
    </div>
  );
}

/**
 * All three editor tabs stay mounted; only the visible one is shown. Switching is then a style
 * change (no remount mid-run), and half-typed values survive a look at another tab.
 */
function EditorTab() {
  const tab = useWb((s) => s.tab);
  const api = useWbApi();
  return (
    <>
      <div hidden={tab !== "stage"}>
        <FieldScopeProvider api={api} scope="scenario" tab="stage">
          <StagePanel />
        </FieldScopeProvider>
      </div>
      <div hidden={tab !== "signal"}>
        <FieldScopeProvider api={api} scope="scenario" tab="signal">
          <SignalPanel />
        </FieldScopeProvider>
      </div>
      <div hidden={tab !== "spec"}>
        <FieldScopeProvider api={api} scope="spec" tab="spec">
          <FromSpecPanel />
        </FieldScopeProvider>
      </div>
    </>
  );
}

/**
 * Never lose an edit: unsaved drafts are kept in this browser per scenario (offered back after a
 * reload), closing or reloading the tab asks first, and so does following a link in the app.
 */
function DraftKeeper({ record }: { record: ScenarioRecord }) {
  const api = useWbApi();
  const dirty = useDirty();
  const [offer, setOffer] = useState<StoredDraft<Scenario> | null>(null);

  useEffect(() => {
    setOffer(readDraft<Scenario>(window.localStorage, record.id, api.getState().saved));
  }, [api, record.id]);

  // Keep the draft while it differs from the saved version (written a moment after the last edit).
  useEffect(() => {
    let timer = 0;
    const unsub = api.subscribe((s, prev) => {
      if (s.revision === prev.revision && s.savedRevision === prev.savedRevision) return;
      clearTimeout(timer);
      timer = window.setTimeout(() => {
        const st = api.getState();
        if (st.revision !== st.savedRevision) writeDraft(window.localStorage, st.scenarioId, st.version, st.draft);
        else clearDraft(window.localStorage, st.scenarioId);
      }, 300);
    });
    return () => {
      clearTimeout(timer);
      unsub();
    };
  }, [api]);

  useEffect(() => {
    if (!dirty) return;
    const onBeforeUnload = (e: BeforeUnloadEvent) => {
      e.preventDefault();
      e.returnValue = "";
    };
    // Links inside the app: ask before leaving (capture phase, before the router sees the click).
    const onClick = (e: MouseEvent) => {
      if (e.defaultPrevented || e.button !== 0 || e.metaKey || e.ctrlKey || e.shiftKey || e.altKey) return;
      const a = (e.target as Element | null)?.closest?.("a[href]") as HTMLAnchorElement | null;
      if (!a || a.target === "_blank" || a.hasAttribute("download")) return;
      const url = new URL(a.href, window.location.href);
      if (
        url.origin !== window.location.origin ||
        (url.pathname === window.location.pathname && url.search === window.location.search)
      )
        return;
      if (
        !window.confirm(
          "This scenario has unsaved edits. Leave the page anyway? The draft stays in this browser and is offered back when you return.",
        )
      ) {
        e.preventDefault();
        e.stopPropagation();
      }
    };
    window.addEventListener("beforeunload", onBeforeUnload);
    document.addEventListener("click", onClick, true);
    return () => {
      window.removeEventListener("beforeunload", onBeforeUnload);
      document.removeEventListener("click", onClick, true);
    };
  }, [dirty]);

  if (!offer) return null;
  const when = new Date(offer.savedAt);
  const newer = offer.baseVersion !== record.version;
  return (
    <div
      className="mb-3 flex flex-wrap items-center gap-2 rounded border-l-[3px] border-caution bg-caution-soft/70 px-3 py-1.5 text-[13px]"
      role="status"
      data-testid="draft-offer"
    >
      <span className="min-w-0 flex-1">
        Unsaved edits from {when.toLocaleString("en-GB", { dateStyle: "medium", timeStyle: "short" })} are kept in this
        browser
        {newer ? ` (made on version ${offer.baseVersion}; the saved scenario is now version ${record.version})` : ""}.
      </span>
      <Button
        size="sm"
        variant="primary"
        data-testid="restore-draft"
        onClick={() => {
          const parsed = scenarioSchema.safeParse(offer.draft);
          api.getState().replaceDraft(parsed.success ? parsed.data : offer.draft);
          setOffer(null);
        }}
      >
        Restore them
      </Button>
      <Button
        size="sm"
        variant="ghost"
        data-testid="discard-draft"
        onClick={() => {
          clearDraft(window.localStorage, record.id);
          setOffer(null);
        }}
      >
        Discard
      </Button>
    </div>
  );
}

function StudiesScope() {
  const api = useWbApi();
  return (
    <FieldScopeProvider api={api} scope="study">
      <WorkbenchStudies />
    </FieldScopeProvider>
  );
}

function SummaryLink({ id }: { id: string }) {
  return (
    <Link href={`/scenarios/${id}/summary`} className={buttonClasses("secondary", "sm")} target="_blank" rel="noopener">
      Design summary
    </Link>
  );
}

/** Unsaved edits: the draft has changed since it was loaded or saved (a revision counter, not a deep compare). */
function useDirty(): boolean {
  return useWb((s) => s.revision !== s.savedRevision);
}

function useSave() {
  const api = useWbApi();
  const { mutate } = useSWRConfig();
  return async (note?: string): Promise<boolean> => {
    const st = api.getState();
    if (refuseIfInvalid(api, ["scenario"], "Save")) return false;
    const changeNote = note?.trim() || undefined;
    const fromRevision = st.revision;
    const parsed = scenarioSchema.safeParse(st.draft);
    if (!parsed.success) {
      st.setNotice({ tone: "error", text: `Not saved — ${scenarioIssuesText(parsed.error.issues)}` });
      return false;
    }
    try {
      const rec = await saveScenario(st.scenarioId, {
        scenario: parsed.data,
        baseVersion: st.version,
        ...(changeNote ? { note: changeNote } : {}),
      });
      api.getState().markSaved(parseScenario(rec.scenario), rec.version, fromRevision);
      await Promise.all([mutate(scenarioKey(st.scenarioId)), mutate(versionsKey(st.scenarioId))]);
      api.getState().setNotice({
        tone: "ok",
        text: changeNote
          ? `Saved as version ${rec.version} with the note “${changeNote}”.`
          : `Saved as version ${rec.version}.`,
      });
      return true;
    } catch (e) {
      const conflict = e instanceof HttpError && e.status === 409;
      api.getState().setNotice({
        tone: "error",
        text: conflict
          ? "Someone saved this scenario after you opened it. Reload to see their version (your edits stay here until you do)."
          : `Not saved — ${errorMessage(e)}`,
      });
      return false;
    }
  };
}

function RunBar() {
  const { run, cancel } = useRunner();
  const status = useWb((s) => s.status);
  const progress = useWb((s) => s.progress);
  const runError = useWb((s) => s.runError);
  const result = useWb((s) => s.result);
  const dirty = useDirty();
  // Invalid fields keep Save pressable, so pressing it says what is wrong instead of nothing.
  const invalid = useWb((s) => Object.values(s.fieldProblems).some((p) => p.scope === "scenario"));
  const save = useSave();
  const [saving, setSaving] = useState(false);
  const [note, setNote] = useState("");
  const bank = useBank();
  const resultKey = useWb((s) => s.resultKey);
  const solverReady = useWb((s) => s.solverReady);

  // Ctrl+Enter / Cmd+Enter runs from anywhere on the page, fields included.
  useEffect(() => {
    const onKey = (e: KeyboardEvent) => {
      if (e.key === "Enter" && (e.ctrlKey || e.metaKey)) {
        e.preventDefault();
        (document.activeElement as HTMLElement | null)?.blur?.();
        void run();
      }
      if (e.key === "Escape" && status === "running") cancel();
    };
    window.addEventListener("keydown", onKey);
    return () => window.removeEventListener("keydown", onKey);
  }, [run, cancel, status]);

  const exportCsv = () => {
    const wf = bank.get(resultKey);
    if (!wf || !result) return;
    downloadSamplesCsv(
      wf.t,
      wf.input,
      wf.output,
      `${slug(result.scenario.name ?? "scenario")}-samples.csv`,
      extraSampleColumns(result.scenario, wf),
    );
  };

  const running = status === "running";
  return (
    <div
      className="flex flex-wrap items-center gap-2 rounded-lg border border-paper-line bg-paper-card px-3 py-2"
      data-testid="run-bar"
    >
      <Button
        variant="primary"
        size="sm"
        onClick={() => void run()}
        disabled={running}
        aria-keyshortcuts="Control+Enter"
        data-testid="run-button"
      >
        Run <kbd className="hidden rounded bg-copper-deep/40 px-1 font-mono text-[10.5px] sm:inline">Ctrl ↵</kbd>
      </Button>
      {running ? (
        <Button size="sm" variant="secondary" onClick={cancel} data-testid="cancel-button">
          Cancel
        </Button>
      ) : null}
      <div className="flex min-w-[180px] flex-1 items-center gap-2">
        <div
          className="h-1.5 flex-1 overflow-hidden rounded-full bg-paper-sunk"
          role="progressbar"
          aria-label="Run progress"
          aria-valuemin={0}
          aria-valuemax={100}
          aria-valuenow={Math.round(progress * 100)}
        >
          <div
            className={`h-full rounded-full ${status === "error" ? "bg-alert" : "bg-copper"}`}
            style={{ width: `${(running || status === "done" ? progress : 0) * 100}%` }}
          />
        </div>
        <span className="min-w-[11rem] text-[12px] text-ink-mute" data-testid="run-status">
          {running
            ? `Running… ${Math.round(progress * 100)} %`
            : status === "done" && result
              ? `Done in ${result.wallMs.toFixed(0)} ms · ${result.points.toLocaleString("en")} samples`
              : status === "cancelled"
                ? "Cancelled."
                : status === "refused"
                  ? "Not run: fix the fields listed below."
                  : status === "error"
                    ? "Run failed."
                    : solverReady
                      ? "Solver ready."
                      : "Starting the solver…"}
        </span>
      </div>
      <span className="mx-1 h-5 w-px bg-paper-line" aria-hidden />
      <span data-testid="save-state">
        {dirty ? <Badge tone="caution">unsaved edits</Badge> : <Badge tone="moss">saved</Badge>}
      </span>
      {dirty ? (
        <input
          aria-label="Change note (optional)"
          placeholder="change note (optional)"
          title="Saved with the new version; reviewers read it beside the list of changed fields"
          value={note}
          maxLength={500}
          onChange={(e) => setNote(e.target.value)}
          onKeyDown={async (e) => {
            if (e.key !== "Enter" || saving) return;
            e.preventDefault();
            setSaving(true);
            if (await save(note)) setNote("");
            setSaving(false);
          }}
          data-testid="change-note"
          className="h-7 w-48 min-w-0 rounded border border-paper-line bg-white px-2 text-[13px] outline-none focus:border-indigo"
        />
      ) : null}
      <Button
        size="sm"
        variant="secondary"
        disabled={(!dirty && !invalid) || saving}
        title={!dirty && !invalid ? "Nothing to save: no edits since the last save" : undefined}
        data-testid="save-button"
        onClick={async () => {
          setSaving(true);
          if (await save(note)) setNote("");
          setSaving(false);
        }}
      >
        {saving ? "Saving…" : "Save"}
      </Button>
      <Button
        size="sm"
        variant="ghost"
        disabled={!result}
        onClick={exportCsv}
        title={
          result ? "Samples of the latest run as CSV" : "Run the scenario first: the CSV holds the latest run's samples"
        }
      >
        CSV
      </Button>
      {runError ? (
        <p className="basis-full text-[12.5px] text-alert" role="alert">
          {runError}
        </p>
      ) : null}
    </div>
  );
}

function SaveRunControl() {
  const api = useWbApi();
  const scenarioId = useWb((s) => s.scenarioId);
  const dirty = useDirty();
  const save = useSave();
  const { mutate } = useSWRConfig();
  const [label, setLabel] = useState("");
  const [busy, setBusy] = useState(false);
  return (
    <form
      className="flex items-center gap-1.5"
      onSubmit={async (e) => {
        e.preventDefault();
        if (refuseIfInvalid(api, ["scenario"], "Save run")) return;
        setBusy(true);
        try {
          if (dirty && !(await save())) return;
          const rec = await saveRun(scenarioId, label.trim() || undefined);
          await mutate(runsKey(scenarioId));
          setLabel("");
          api.getState().setNotice({ tone: "ok", text: `Run saved: /runs/${rec.id}` });
        } catch (err) {
          api.getState().setNotice({ tone: "error", text: `Run not saved — ${errorMessage(err)}` });
        } finally {
          setBusy(false);
        }
      }}
    >
      <input
        aria-label="Run label"
        placeholder="label (optional)"
        value={label}
        maxLength={120}
        onChange={(e) => setLabel(e.target.value)}
        className="h-7 w-40 rounded border border-paper-line bg-white px-2 text-[13px] outline-none focus:border-indigo"
      />
      <Button
        type="submit"
        size="sm"
        variant="primary"
        disabled={busy}
        data-testid="save-run-button"
        title={
          dirty
            ? "Saves your edits first, then the server re-runs and stores the scenario"
            : "The server re-runs the saved scenario and stores it"
        }
      >
        {busy ? "Saving run…" : "Save run"}
      </Button>
    </form>
  );
}

function focusField(api: ReturnType<typeof useWbApi>, f: FieldProblem) {
  if (f.tab) api.getState().setTab(f.tab);
  requestAnimationFrame(() => document.getElementById(f.inputId)?.focus());
}

function Notice() {
  const api = useWbApi();
  const notice = useWb((s) => s.notice);
  const setNotice = useWb((s) => s.setNotice);
  useEffect(() => {
    if (notice?.tone !== "ok") return;
    const t = setTimeout(() => setNotice(null), 8000);
    return () => clearTimeout(t);
  }, [notice, setNotice]);
  if (!notice) return null;
  const runLink = notice.text.match(/\/runs\/([\w-]+)/);
  return (
    <div
      role={notice.tone === "error" ? "alert" : "status"}
      data-testid="workbench-notice"
      className={`mt-2 flex items-start justify-between gap-3 rounded border-l-[3px] px-3 py-1.5 text-[13px] ${
        notice.tone === "error" ? "border-alert bg-alert-soft/70" : "border-moss bg-moss-soft/70"
      }`}
    >
      <span>
        {notice.fields?.length ? (
          <>
            {notice.text}
            <ul className="mt-0.5 list-disc pl-5" data-testid="fields-at-fault">
              {notice.fields.map((f) => (
                <li key={f.inputId}>
                  <button
                    type="button"
                    className="text-left underline decoration-dotted"
                    onClick={() => focusField(api, f)}
                  >
                    {f.label}
                  </button>
                  : {f.message}
                </li>
              ))}
            </ul>
          </>
        ) : runLink ? (
          <>
            Run saved.{" "}
            <Link
              href={`/runs/${runLink[1]}`}
              className="font-medium text-copper-deep underline"
              data-testid="saved-run-link"
            >
              Open the run
            </Link>
          </>
        ) : (
          notice.text
        )}
      </span>
      <button
        type="button"
        className="text-ink-mute hover:text-ink"
        onClick={() => setNotice(null)}
        aria-label="Dismiss"
      >
        ×
      </button>
    </div>
  );
}

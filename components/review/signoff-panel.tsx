"use client";

import { useState, type FormEvent } from "react";
import { Button } from "@/components/ui/button";
import { Dialog } from "@/components/ui/dialog";
import { Field, TextArea } from "@/components/ui/field";
import { errorMessage, sendJson } from "@/lib/client/fetcher";
import { signoffKey, signoffsKey, useSignoffList } from "@/lib/client/review-hooks";
import { DECISION_LABEL, NOTE_MAX, type DecisionName } from "@/lib/schemas/team";
import type { SignoffRecord } from "@/lib/schemas/review";
import { formatDate } from "@/components/ui/format";
import { ReviewStateBadge } from "./review-state-badge";

export interface RunSubject {
  label: string;
  scenarioName: string;
  /** The scenario version the run was made from (what an approval applies to). */
  scenarioVersion: number | null;
  /** The scenario's current version, when known: a decision on an older one is out of date. */
  currentVersion?: number | null;
}

const versionText = (v: number | null | undefined) => (v ? `version ${v}` : "an unversioned snapshot");

/**
 * Review state, the history of decisions, and (for owner/reviewer) a deliberate sign-off: no
 * decision is chosen in advance, an approval is confirmed in a dialog that names what is
 * approved, "Request changes" needs a note, and a reviewer can withdraw their own decision.
 */
export function SignoffPanel({
  runId,
  canSignOff,
  userId,
  subject,
  onChange,
}: {
  runId: string;
  canSignOff: boolean;
  userId?: string | null;
  subject?: RunSubject | null;
  onChange?: () => void;
}) {
  const { data, error, mutate } = useSignoffList(runId);
  const [decision, setDecision] = useState<DecisionName | null>(null);
  const [note, setNote] = useState("");
  const [problem, setProblem] = useState<string | null>(null);
  const [noteProblem, setNoteProblem] = useState<string | null>(null);
  const [confirming, setConfirming] = useState(false);
  const [busy, setBusy] = useState(false);

  async function record(d: DecisionName) {
    setBusy(true);
    setProblem(null);
    try {
      await sendJson(signoffsKey(runId), "POST", { decision: d, note });
      setNote("");
      setDecision(null);
      setConfirming(false);
      await mutate();
      onChange?.();
    } catch (err) {
      setProblem(errorMessage(err));
      setConfirming(false);
    } finally {
      setBusy(false);
    }
  }

  function submit(e: FormEvent) {
    e.preventDefault();
    setProblem(null);
    setNoteProblem(null);
    if (!decision) {
      setProblem("Choose a decision first: approve, or request changes.");
      return;
    }
    if (decision === "changes_requested" && !note.trim()) {
      setNoteProblem("Say what must change: a note is required when requesting changes.");
      return;
    }
    if (decision === "approved") setConfirming(true);
    else void record(decision);
  }

  async function withdraw(s: SignoffRecord) {
    setBusy(true);
    setProblem(null);
    try {
      await sendJson(signoffKey(runId, s.id), "DELETE");
      await mutate();
      onChange?.();
    } catch (err) {
      setProblem(errorMessage(err));
    } finally {
      setBusy(false);
    }
  }

  const items = data?.items ?? [];
  const withdrawn = data?.withdrawn ?? [];
  const latest = items[0];
  const outOfDate = (s: SignoffRecord | undefined) =>
    !!s && s.scenarioVersion != null && subject?.currentVersion != null && subject.currentVersion > s.scenarioVersion;
  return (
    <div className="flex flex-col gap-3">
      <div className="flex flex-wrap items-center gap-2" data-testid="review-state">
        <ReviewStateBadge decision={latest?.decision ?? null} />
        {latest && (
          <span className="text-[12px] text-ink-mute">
            by {latest.reviewer.name}, {formatDate(latest.createdAt)}
            {latest.scenarioVersion ? ` · for version ${latest.scenarioVersion}` : ""}
          </span>
        )}
        {outOfDate(latest) && (
          <span
            className="rounded bg-caution-soft px-1.5 py-0.5 text-[12px] font-medium text-caution"
            data-testid="signoff-out-of-date"
          >
            Out of date: the scenario is now at version {subject?.currentVersion}
          </span>
        )}
      </div>
      {error && <p className="text-[13px] text-alert">{errorMessage(error)}</p>}
      {latest?.note && <p className="text-[13px] whitespace-pre-wrap break-words text-ink-soft">{latest.note}</p>}
      {items.length > 0 && (
        <ol className="flex flex-col gap-1.5 text-[13px]" aria-label="Standing decisions">
          {items.map((s) => (
            <li key={s.id} className="flex flex-wrap items-baseline gap-x-2 text-ink-soft">
              <span className="font-medium text-ink">{DECISION_LABEL[s.decision]}</span>
              <span>
                {s.reviewer.name} ·{" "}
                <span className="font-mono text-[11px] text-ink-faint">{formatDate(s.createdAt)}</span>
                {s.scenarioVersion ? ` · v${s.scenarioVersion}` : ""}
              </span>
              {canSignOff && userId && s.reviewer.id === userId && (
                <Button size="sm" variant="ghost" className="ml-auto" disabled={busy} onClick={() => void withdraw(s)}>
                  Withdraw my decision
                </Button>
              )}
            </li>
          ))}
        </ol>
      )}
      {withdrawn.length > 0 && (
        <details className="text-[13px]">
          <summary className="cursor-pointer text-[12px] text-ink-mute">
            Withdrawn or replaced ({withdrawn.length})
          </summary>
          <ol className="mt-1.5 flex flex-col gap-1.5" aria-label="Withdrawn sign-offs">
            {withdrawn.map((s) => (
              <li key={s.id} className="text-ink-soft">
                <span className="line-through">{DECISION_LABEL[s.decision]}</span> · {s.reviewer.name} ·{" "}
                <span className="font-mono text-[11px] text-ink-faint">{formatDate(s.createdAt)}</span> · withdrawn{" "}
                {formatDate(s.withdrawnAt)}
                {s.note && <p className="mt-0.5 whitespace-pre-wrap break-words">{s.note}</p>}
              </li>
            ))}
          </ol>
        </details>
      )}
      {canSignOff && (
        <form
          onSubmit={submit}
          className="flex flex-col gap-2 border-t border-paper-line pt-3"
          aria-label="Sign off"
          noValidate
        >
          <fieldset className="flex flex-wrap gap-4">
            <legend className="mb-1 text-[12px] font-medium text-ink-soft">Your decision</legend>
            {(["approved", "changes_requested"] as const).map((d) => (
              <label key={d} className="flex items-center gap-1.5 text-[13px] text-ink">
                <input
                  type="radio"
                  name={`decision-${runId}`}
                  value={d}
                  checked={decision === d}
                  onChange={() => {
                    setDecision(d);
                    setProblem(null);
                  }}
                  className="accent-copper"
                />
                {d === "approved" ? "Approve" : "Request changes"}
              </label>
            ))}
          </fieldset>
          <Field
            label="Note"
            htmlFor={`note-${runId}`}
            hint={decision === "changes_requested" ? "Required: say what must change." : "Optional for an approval."}
            error={noteProblem ?? undefined}
          >
            <TextArea
              id={`note-${runId}`}
              rows={2}
              className="min-h-14"
              maxLength={NOTE_MAX}
              value={note}
              aria-required={decision === "changes_requested"}
              onChange={(e) => {
                setNote(e.target.value);
                setNoteProblem(null);
              }}
            />
          </Field>
          <div className="flex items-center justify-end gap-2">
            {!decision ? (
              <span className="text-[12px] text-ink-mute" data-testid="signoff-blocked">
                Choose a decision above first.
              </span>
            ) : null}
            <Button type="submit" variant="primary" size="sm" disabled={busy || !decision}>
              {busy
                ? "Saving…"
                : decision === "approved"
                  ? "Approve…"
                  : decision === "changes_requested"
                    ? "Request changes"
                    : "Sign off"}
            </Button>
          </div>
          {problem && (
            <p role="alert" className="text-[13px] text-alert">
              {problem}
            </p>
          )}
        </form>
      )}
      <Dialog
        open={confirming}
        onClose={() => setConfirming(false)}
        size="sm"
        title="Approve this run?"
        description="Your name and the date go on the record; the run's author is told by mail."
        footer={
          <>
            <Button size="sm" variant="secondary" onClick={() => setConfirming(false)} disabled={busy}>
              Cancel
            </Button>
            <Button size="sm" variant="primary" onClick={() => void record("approved")} disabled={busy}>
              {busy ? "Saving…" : `Approve ${subject?.scenarioVersion ? `version ${subject.scenarioVersion}` : "run"}`}
            </Button>
          </>
        }
      >
        <dl
          className="grid grid-cols-[auto_minmax(0,1fr)] gap-x-3 gap-y-1 text-[13px]"
          data-testid="approve-confirmation"
        >
          <dt className="text-ink-mute">Scenario</dt>
          <dd className="break-words font-medium">{subject?.scenarioName ?? "—"}</dd>
          <dt className="text-ink-mute">Version</dt>
          <dd>{versionText(subject?.scenarioVersion)}</dd>
          <dt className="text-ink-mute">Run</dt>
          <dd className="break-words">{subject?.label ?? runId}</dd>
        </dl>
        <p className="mt-3 text-[12px] text-ink-mute">
          The approval covers this run of {versionText(subject?.scenarioVersion)} only; a later edit of the scenario
          shows it as out of date.
        </p>
        {note.trim() && (
          <p className="mt-2 whitespace-pre-wrap break-words text-[13px] text-ink-soft">Note: {note.trim()}</p>
        )}
      </Dialog>
    </div>
  );
}

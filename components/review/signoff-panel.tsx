"use client";

import { useState, type FormEvent } from "react";
import { Button } from "@/components/ui/button";
import { Field, TextArea } from "@/components/ui/field";
import { errorMessage, sendJson } from "@/lib/client/fetcher";
import { signoffsKey, useSignoffs } from "@/lib/client/team-hooks";
import { DECISION_LABEL, NOTE_MAX, type DecisionName } from "@/lib/schemas/team";
import { formatDate } from "@/components/ui/format";
import { ReviewStateBadge } from "./review-state-badge";

/** Review state, the history of decisions, and (for owner/reviewer) the sign-off form. */
export function SignoffPanel({ runId, canSignOff, onChange }: { runId: string; canSignOff: boolean; onChange?: () => void }) {
  const { data, error, mutate } = useSignoffs(runId);
  const [decision, setDecision] = useState<DecisionName>("approved");
  const [note, setNote] = useState("");
  const [problem, setProblem] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  async function submit(e: FormEvent) {
    e.preventDefault();
    setBusy(true);
    setProblem(null);
    try {
      await sendJson(signoffsKey(runId), "POST", { decision, note });
      setNote("");
      await mutate();
      onChange?.();
    } catch (err) {
      setProblem(errorMessage(err));
    } finally {
      setBusy(false);
    }
  }

  const items = data?.items ?? [];
  const latest = items[0];
  return (
    <div className="flex flex-col gap-3">
      <div className="flex flex-wrap items-center gap-2" data-testid="review-state">
        <ReviewStateBadge decision={latest?.decision ?? null} />
        {latest && (
          <span className="text-[12px] text-ink-mute">
            by {latest.reviewer.name}, {formatDate(latest.createdAt)}
          </span>
        )}
      </div>
      {error && <p className="text-[13px] text-alert">{errorMessage(error)}</p>}
      {latest?.note && <p className="text-[13px] whitespace-pre-wrap break-words text-ink-soft">{latest.note}</p>}
      {items.length > 1 && (
        <details className="text-[13px]">
          <summary className="cursor-pointer text-[12px] text-ink-mute">Earlier decisions ({items.length - 1})</summary>
          <ol className="mt-1.5 flex flex-col gap-1.5" aria-label="Earlier sign-offs">
            {items.slice(1).map((s) => (
              <li key={s.id} className="text-ink-soft">
                <span className="font-medium text-ink">{DECISION_LABEL[s.decision]}</span> · {s.reviewer.name} ·{" "}
                <span className="font-mono text-[11px] text-ink-faint">{formatDate(s.createdAt)}</span>
                {s.note && <p className="mt-0.5 whitespace-pre-wrap break-words">{s.note}</p>}
              </li>
            ))}
          </ol>
        </details>
      )}
      {canSignOff && (
        <form onSubmit={submit} className="flex flex-col gap-2 border-t border-paper-line pt-3" aria-label="Sign off">
          <fieldset className="flex flex-wrap gap-4">
            <legend className="sr-only">Decision</legend>
            {(["approved", "changes_requested"] as const).map((d) => (
              <label key={d} className="flex items-center gap-1.5 text-[13px] text-ink">
                <input type="radio" name={`decision-${runId}`} value={d} checked={decision === d} onChange={() => setDecision(d)} className="accent-copper" />
                {d === "approved" ? "Approve" : "Request changes"}
              </label>
            ))}
          </fieldset>
          <Field label="Note" htmlFor={`note-${runId}`} hint={decision === "changes_requested" ? "Say what must change." : "Optional."}>
            <TextArea id={`note-${runId}`} rows={2} className="min-h-14" maxLength={NOTE_MAX} value={note} onChange={(e) => setNote(e.target.value)} />
          </Field>
          <div className="flex justify-end">
            <Button type="submit" variant="primary" size="sm" disabled={busy}>
              {busy ? "Saving…" : "Sign off"}
            </Button>
          </div>
          {problem && (
            <p role="alert" className="text-[13px] text-alert">
              {problem}
            </p>
          )}
        </form>
      )}
    </div>
  );
}

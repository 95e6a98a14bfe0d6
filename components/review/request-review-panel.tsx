"use client";

import { useState, type FormEvent } from "react";
import { Button } from "@/components/ui/button";
import { Field, TextArea } from "@/components/ui/field";
import { formatDate } from "@/components/ui/format";
import { errorMessage, sendJson } from "@/lib/client/fetcher";
import { useMembers } from "@/lib/client/team-hooks";
import { reviewRequestsKey, useReviewRequests } from "@/lib/client/review-hooks";
import { DECISION_LABEL } from "@/lib/schemas/team";
import { REVIEW_NOTE_MAX } from "@/lib/schemas/review";
import { ReviewStateBadge } from "./review-state-badge";

/**
 * Who was asked to review this run and what each decided; owners and designers ask members
 * who may sign off (owners, reviewers), who then get a mail and find the run in their queue.
 */
export function RequestReviewPanel({
  runId,
  canRequest,
  userId,
}: {
  runId: string;
  canRequest: boolean;
  userId?: string | null;
}) {
  const requests = useReviewRequests(runId);
  const members = useMembers();
  const [chosen, setChosen] = useState<string[]>([]);
  const [note, setNote] = useState("");
  const [problem, setProblem] = useState<string | null>(null);
  const [done, setDone] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  const asked = new Set((requests.data?.items ?? []).map((r) => r.reviewer.id));
  const signers = (members.data?.items ?? []).filter(
    (m) => (m.role === "owner" || m.role === "reviewer") && m.id !== userId,
  );

  async function submit(e: FormEvent) {
    e.preventDefault();
    setProblem(null);
    setDone(null);
    if (chosen.length === 0) {
      setProblem("Choose at least one reviewer.");
      return;
    }
    setBusy(true);
    try {
      await sendJson(reviewRequestsKey(runId), "POST", { reviewerIds: chosen, note });
      const names = signers.filter((m) => chosen.includes(m.id)).map((m) => m.name);
      setDone(`Review requested from ${names.join(", ")}; they were sent a mail.`);
      setChosen([]);
      setNote("");
      await requests.mutate();
    } catch (err) {
      setProblem(errorMessage(err));
    } finally {
      setBusy(false);
    }
  }

  const items = requests.data?.items ?? [];
  return (
    <div className="flex flex-col gap-3">
      {items.length === 0 ? (
        <p className="text-[13px] text-ink-mute">Nobody has been asked to review this run yet.</p>
      ) : (
        <ul className="flex flex-col gap-1.5 text-[13px]" aria-label="Review requests">
          {items.map((r) => (
            <li key={r.id} className="flex flex-wrap items-center gap-x-2 gap-y-0.5">
              <span className="font-medium text-ink">{r.reviewer.name}</span>
              {r.decision ? <ReviewStateBadge decision={r.decision} /> : <span className="text-ink-mute">waiting</span>}
              <span className="text-[12px] text-ink-faint">
                asked by {r.requestedBy.name}, {formatDate(r.createdAt)}
                {r.decidedAt ? ` · ${DECISION_LABEL[r.decision!].toLowerCase()} ${formatDate(r.decidedAt)}` : ""}
              </span>
            </li>
          ))}
        </ul>
      )}
      {canRequest && (
        <form
          onSubmit={submit}
          className="flex flex-col gap-2 border-t border-paper-line pt-3"
          aria-label="Request review"
        >
          <fieldset>
            <legend className="mb-1 text-[12px] font-medium text-ink-soft">Reviewers</legend>
            {signers.length === 0 && <p className="text-[13px] text-ink-mute">No other member can sign off.</p>}
            <div className="flex flex-col gap-1">
              {signers.map((m) => (
                <label key={m.id} className="flex items-center gap-1.5 text-[13px] text-ink">
                  <input
                    type="checkbox"
                    className="accent-copper"
                    checked={chosen.includes(m.id)}
                    disabled={asked.has(m.id)}
                    onChange={(e) => setChosen((c) => (e.target.checked ? [...c, m.id] : c.filter((x) => x !== m.id)))}
                  />
                  {m.name}{" "}
                  <span className="text-[12px] text-ink-mute">
                    ({m.role}
                    {asked.has(m.id) ? ", already asked" : ""})
                  </span>
                </label>
              ))}
            </div>
          </fieldset>
          <Field label="Message to the reviewers" htmlFor={`request-note-${runId}`} hint="Optional: what to look at.">
            <TextArea
              id={`request-note-${runId}`}
              rows={2}
              className="min-h-12"
              maxLength={REVIEW_NOTE_MAX}
              value={note}
              onChange={(e) => setNote(e.target.value)}
            />
          </Field>
          <div className="flex justify-end">
            <Button type="submit" size="sm" variant="primary" disabled={busy}>
              {busy ? "Sending…" : "Request review"}
            </Button>
          </div>
          {done && (
            <p role="status" className="text-[13px] text-moss">
              {done}
            </p>
          )}
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

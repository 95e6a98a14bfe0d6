"use client";

import { useState, type FormEvent } from "react";
import { Button } from "@/components/ui/button";
import { TextArea } from "@/components/ui/field";
import { errorMessage, sendJson } from "@/lib/client/fetcher";
import { commentsKey, useComments } from "@/lib/client/team-hooks";
import { COMMENT_MAX } from "@/lib/schemas/team";
import { formatDate } from "@/components/ui/format";

/** Comments on a run, oldest first, with a plain-text form for those who may comment. */
export function CommentsPanel({ runId, canComment }: { runId: string; canComment: boolean }) {
  const { data, error, mutate } = useComments(runId);
  const [body, setBody] = useState("");
  const [problem, setProblem] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  async function submit(e: FormEvent) {
    e.preventDefault();
    setBusy(true);
    setProblem(null);
    try {
      await sendJson(commentsKey(runId), "POST", { body });
      setBody("");
      await mutate();
    } catch (err) {
      setProblem(errorMessage(err));
    } finally {
      setBusy(false);
    }
  }

  const items = data?.items ?? [];
  return (
    <div className="flex flex-col gap-3">
      {error ? (
        <p className="text-[13px] text-alert">{errorMessage(error)}</p>
      ) : items.length === 0 ? (
        <p className="text-[13px] text-ink-mute">No comments yet.</p>
      ) : (
        <ol className="flex flex-col gap-2" aria-label="Comments">
          {items.map((c) => (
            <li key={c.id} className="rounded-md border border-paper-line bg-paper/60 px-3 py-2">
              <div className="flex flex-wrap items-baseline justify-between gap-x-3">
                <span className="text-[13px] font-medium text-ink">{c.author.name}</span>
                <span className="font-mono text-[11px] text-ink-faint">{formatDate(c.createdAt)}</span>
              </div>
              <p className="mt-1 text-[13px] whitespace-pre-wrap break-words text-ink-soft">{c.body}</p>
            </li>
          ))}
        </ol>
      )}
      {canComment && (
        <form onSubmit={submit} className="flex flex-col gap-2">
          <label htmlFor={`comment-${runId}`} className="sr-only">
            Comment
          </label>
          <TextArea
            id={`comment-${runId}`}
            value={body}
            maxLength={COMMENT_MAX}
            onChange={(e) => setBody(e.target.value)}
            placeholder="Plain text; say what you checked and what you saw."
            rows={3}
          />
          <div className="flex items-center justify-between gap-2">
            <span className="font-mono text-[11px] text-ink-faint">
              {body.length}/{COMMENT_MAX}
            </span>
            <Button
              type="submit"
              size="sm"
              disabled={busy || !body.trim()}
              title={!body.trim() ? "Write the comment first" : undefined}
            >
              {busy ? "Posting…" : "Post comment"}
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

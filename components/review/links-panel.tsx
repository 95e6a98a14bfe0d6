"use client";

import { useState } from "react";
import { Button } from "@/components/ui/button";
import { Badge } from "@/components/ui/badge";
import { Select, TextInput } from "@/components/ui/field";
import { errorMessage, sendJson } from "@/lib/client/fetcher";
import { runLinksKey, useRunLinks } from "@/lib/client/team-hooks";
import type { RunLinkCreatedJson } from "@/lib/schemas/responses";
import { LINK_LABEL_MAX } from "@/lib/schemas/review";

import { formatDate } from "@/components/ui/format";

const EXPIRY_CHOICES = [
  { value: "", label: "No expiry" },
  { value: "1", label: "1 day" },
  { value: "7", label: "7 days" },
  { value: "30", label: "30 days" },
];

/** Create and revoke read-only links to one run (owner/designer). The URL is shown once. */
export function LinksPanel({ runId }: { runId: string }) {
  const { data, error, mutate } = useRunLinks(runId);
  const [days, setDays] = useState("7");
  const [label, setLabel] = useState("");
  const [fresh, setFresh] = useState<RunLinkCreatedJson | null>(null);
  const [copied, setCopied] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  async function create() {
    setBusy(true);
    setProblem(null);
    setCopied(false);
    try {
      const link = await sendJson<RunLinkCreatedJson>(runLinksKey(runId), "POST", {
        ...(days ? { expiresInDays: Number(days) } : {}),
        ...(label.trim() ? { label: label.trim() } : {}),
      });
      setLabel("");
      // The server knows its public origin only from config; the browser's origin is what the user shares.
      setFresh({ ...link, url: `${window.location.origin}/share/${link.token}` });
      await mutate();
    } catch (err) {
      setProblem(errorMessage(err));
    } finally {
      setBusy(false);
    }
  }

  async function revoke(id: string) {
    setBusy(true);
    setProblem(null);
    try {
      await sendJson(`${runLinksKey(runId)}/${id}`, "DELETE");
      if (fresh?.id === id) setFresh(null);
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
      <div className="flex flex-wrap items-center gap-2">
        <label htmlFor={`link-label-${runId}`} className="text-[12px] text-ink-soft">
          For
        </label>
        <TextInput
          id={`link-label-${runId}`}
          className="h-7! min-w-0 flex-1 py-0 text-[13px]"
          placeholder="who gets it, e.g. bench tech at the yard"
          maxLength={LINK_LABEL_MAX}
          value={label}
          onChange={(e) => setLabel(e.target.value)}
        />
      </div>
      <div className="flex flex-wrap items-center gap-2">
        <label htmlFor={`expiry-${runId}`} className="text-[12px] text-ink-soft">
          Expires
        </label>
        <Select
          id={`expiry-${runId}`}
          className="h-7! w-28 py-0 text-[13px]"
          value={days}
          onChange={(e) => setDays(e.target.value)}
        >
          {EXPIRY_CHOICES.map((c) => (
            <option key={c.value} value={c.value}>
              {c.label}
            </option>
          ))}
        </Select>
        <Button size="sm" onClick={create} disabled={busy}>
          Create link
        </Button>
      </div>
      {fresh?.url && (
        <div className="rounded-md border border-indigo/25 bg-indigo-soft/50 p-2.5" role="status">
          <p className="text-[12px] text-ink-soft">
            Copy it now: the link is stored only as a hash and is not shown again.
          </p>
          <div className="mt-1.5 flex items-center gap-2">
            <input
              readOnly
              value={fresh.url}
              aria-label="New run link"
              className="h-7 min-w-0 flex-1 rounded border border-paper-line bg-paper-card px-2 font-mono text-[12px]"
              onFocus={(e) => e.target.select()}
            />
            <Button
              size="sm"
              onClick={() => {
                void navigator.clipboard?.writeText(fresh.url).then(() => setCopied(true));
              }}
            >
              {copied ? "Copied" : "Copy"}
            </Button>
          </div>
        </div>
      )}
      {error && <p className="text-[13px] text-alert">{errorMessage(error)}</p>}
      {items.length > 0 && (
        <ul className="flex flex-col divide-y divide-paper-line" aria-label="Run links">
          {items.map((l) => (
            <li key={l.id} className="flex flex-wrap items-center justify-between gap-2 py-1.5 text-[12px]">
              <span className="flex min-w-0 flex-col gap-0.5">
                <span className="flex flex-wrap items-center gap-2">
                  <Badge tone={l.state === "active" ? "moss" : "neutral"}>{l.state}</Badge>
                  <span className="break-words font-medium text-ink">{l.label || "(no label)"}</span>
                </span>
                <span className="text-ink-mute">
                  made {formatDate(l.createdAt)} · {l.expiresAt ? `expires ${formatDate(l.expiresAt)}` : "no expiry"} ·{" "}
                  {l.lastUsedAt ? `last opened ${formatDate(l.lastUsedAt)} (${l.useCount ?? 0}×)` : "never opened"}
                </span>
              </span>
              {l.state === "active" && (
                <Button size="sm" variant="danger" onClick={() => revoke(l.id)} disabled={busy}>
                  Revoke
                </Button>
              )}
            </li>
          ))}
        </ul>
      )}
      {problem && (
        <p role="alert" className="text-[13px] text-alert">
          {problem}
        </p>
      )}
    </div>
  );
}

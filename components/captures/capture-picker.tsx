"use client";

import { useState } from "react";
import { Button } from "@/components/ui/button";
import { Select } from "@/components/ui/field";
import { errorMessage, fetchJson } from "@/lib/client/fetcher";
import { captureKey, useCaptures, type CaptureRecord } from "@/lib/client/team-hooks";
import { formatQuantity } from "@/lib/design/notation";

export interface CaptureComponent {
  kind: "capture";
  samples: [number, number][];
}

/**
 * Choose one of the team's captures as a `capture` input component (railwise.scenario/1).
 * The Signal builder mounts this and adds the component it hands back.
 */
export function CapturePicker({
  onPick,
  disabled,
}: {
  onPick: (component: CaptureComponent, capture: CaptureRecord) => void;
  disabled?: boolean;
}) {
  const { data, error } = useCaptures();
  const [id, setId] = useState("");
  const [busy, setBusy] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);
  const items = data?.items ?? [];

  async function use() {
    if (!id) return;
    setBusy(true);
    setProblem(null);
    try {
      const capture = await fetchJson<CaptureRecord>(captureKey(id));
      onPick({ kind: "capture", samples: capture.samples }, capture);
    } catch (err) {
      setProblem(errorMessage(err));
    } finally {
      setBusy(false);
    }
  }

  if (error) return <p className="text-[13px] text-alert">{errorMessage(error)}</p>;
  if (data && items.length === 0) {
    return (
      <p className="text-[13px] text-ink-mute">
        No captures yet; upload one on the{" "}
        <a href="/captures" className="text-indigo underline underline-offset-2">
          Captures
        </a>{" "}
        page.
      </p>
    );
  }
  return (
    <div className="flex flex-col gap-1.5">
      <div className="flex items-center gap-2">
        <Select
          aria-label="Capture"
          className="h-8! min-w-0 flex-1 py-0 text-[13px]"
          value={id}
          onChange={(e) => setId(e.target.value)}
          disabled={disabled}
        >
          <option value="">Choose a capture…</option>
          {items.map((c) => (
            <option key={c.id} value={c.id}>
              {c.name} · {c.points.toLocaleString("en")} pts · {formatQuantity(c.duration, "s")}
            </option>
          ))}
        </Select>
        <Button
          size="sm"
          onClick={use}
          disabled={disabled || busy || !id}
          title={!id && !disabled ? "Choose a capture first" : undefined}
        >
          {busy ? "Loading…" : "Use capture"}
        </Button>
      </div>
      {problem && (
        <p role="alert" className="text-[13px] text-alert">
          {problem}
        </p>
      )}
    </div>
  );
}

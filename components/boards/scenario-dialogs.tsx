"use client";

import { useEffect, useState } from "react";
import { FormDialog } from "@/components/ui/dialog";
import { Field, Select, TextInput } from "@/components/ui/field";
import { STAGE_KIND_LABEL } from "@/lib/workbench/stage-labels";
import { fetchJson, sendJson } from "@/lib/client/fetcher";
import type { ScenarioRecord } from "@/lib/client/hooks";
import { blankScenario } from "@/lib/client/scenario-templates";
import { STAGE_KINDS } from "@/lib/schemas/scenario";

/** A name the user typed, or an error naming the field. */
function requireName(text: string): string {
  const trimmed = text.trim();
  if (!trimmed) throw new Error("Name: give the scenario a name.");
  return trimmed;
}

export interface NewScenarioDialogProps {
  open: boolean;
  boardId: string;
  /** Scenarios on this board, offered as starting points. */
  existing: ScenarioRecord[];
  onClose: () => void;
  onCreated: (created: ScenarioRecord) => void;
}

export function NewScenarioDialog({ open, boardId, existing, onClose, onCreated }: NewScenarioDialogProps) {
  const [name, setName] = useState("");
  // `blank:<kind>` or `copy:<scenarioId>`.
  const [source, setSource] = useState("blank:schmitt-noninverting");

  useEffect(() => {
    if (open) setName("");
  }, [open]);

  async function create() {
    const trimmed = requireName(name);
    const [how, ref] = source.split(":");
    const listed = how === "copy" ? existing.find((s) => s.id === ref) : undefined;
    // List items leave out waveform arrays: copy from the whole stored document.
    const original = listed ? await fetchJson<ScenarioRecord>(`/api/scenarios/${listed.id}`) : undefined;
    const scenario = original
      ? { ...structuredClone(original.scenario), name: trimmed }
      : blankScenario(STAGE_KINDS.find((k) => k === ref) ?? "comparator", trimmed);
    onCreated(await sendJson<ScenarioRecord>("/api/scenarios", "POST", { boardId, name: trimmed, scenario }));
  }

  return (
    <FormDialog
      open={open}
      onClose={onClose}
      title="New scenario"
      description="Start from a blank stage of one kind, or copy a scenario of this board."
      submitLabel="Create scenario"
      busyLabel="Creating…"
      onSubmit={create}
    >
      <Field label="Name" htmlFor="scenario-name">
        <TextInput
          id="scenario-name"
          value={name}
          onChange={(e) => setName(e.target.value)}
          maxLength={120}
          placeholder="e.g. Pump dry-run cut-out"
          autoFocus
        />
      </Field>
      <Field
        label="Start from"
        htmlFor="scenario-source"
        hint="A blank stage starts with custom values for the op-amp (1 MHz, 1 V/µs, output 50 mV from each rail), not a library part; choose one in the Stage panel."
      >
        <Select id="scenario-source" value={source} onChange={(e) => setSource(e.target.value)}>
          <optgroup label="Blank stage">
            {STAGE_KINDS.map((k) => (
              <option key={k} value={`blank:${k}`}>
                {STAGE_KIND_LABEL[k]}
              </option>
            ))}
          </optgroup>
          {existing.length > 0 && (
            <optgroup label="Copy of">
              {existing.map((s) => (
                <option key={s.id} value={`copy:${s.id}`}>
                  {s.name}
                </option>
              ))}
            </optgroup>
          )}
        </Select>
      </Field>
    </FormDialog>
  );
}

export interface ScenarioTargetDialogProps {
  /** The scenario acted on; null keeps the dialog closed. */
  target: ScenarioRecord | null;
  onClose: () => void;
  onDone: (scenario: ScenarioRecord) => void;
}

export function RenameScenarioDialog({ target, onClose, onDone }: ScenarioTargetDialogProps) {
  const [name, setName] = useState("");

  useEffect(() => setName(target?.name ?? ""), [target]);

  async function rename() {
    if (!target) return;
    const trimmed = requireName(name);
    // A rename is a new version like any edit; the document's own name follows the record's.
    onDone(
      await sendJson<ScenarioRecord>(`/api/scenarios/${target.id}`, "PUT", {
        // Name only: the server keeps the stored document (list items lack waveform arrays).
        name: trimmed,
        // Someone saved in between → 409 instead of silently overwriting their edit.
        baseVersion: target.version,
      }),
    );
  }

  return (
    <FormDialog
      open={target !== null}
      onClose={onClose}
      size="sm"
      title="Rename scenario"
      submitLabel="Rename"
      busyLabel="Saving…"
      onSubmit={rename}
    >
      <Field label="Name" htmlFor="rename-name">
        <TextInput id="rename-name" value={name} onChange={(e) => setName(e.target.value)} maxLength={120} autoFocus />
      </Field>
    </FormDialog>
  );
}

export function DeleteScenarioDialog({ target, onClose, onDone }: ScenarioTargetDialogProps) {
  async function remove() {
    if (!target) return;
    await sendJson<unknown>(`/api/scenarios/${target.id}`, "DELETE");
    onDone(target);
  }

  return (
    <FormDialog
      open={target !== null}
      onClose={onClose}
      size="sm"
      title="Delete scenario?"
      tone="danger"
      submitLabel="Delete"
      busyLabel="Deleting…"
      cancelLabel="Keep it"
      onSubmit={remove}
    >
      <p className="text-[14px]">
        <span className="font-medium">{target?.name}</span> will be removed with its version history and saved runs.
        This cannot be undone.
      </p>
    </FormDialog>
  );
}

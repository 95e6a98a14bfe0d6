"use client";

import { useState, type FormEvent } from "react";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { Dialog } from "@/components/ui/dialog";
import { EmptyState } from "@/components/ui/empty-state";
import { Field, TextInput } from "@/components/ui/field";
import { LoadError, LoadingRows } from "@/components/ui/load-state";
import { PageHeader } from "@/components/ui/page-header";
import { Table, TBody, TD, TH, THead, TR } from "@/components/ui/table";
import { HttpError, errorMessage, sendJson } from "@/lib/client/fetcher";
import { partsKey, useParts, type PartProfileRecord } from "@/lib/client/team-hooks";
import { formatQuantity, parseQuantity, quantityProblem } from "@/lib/design/notation";
import { OPAMP_PARAMS, OPAMP_PARAM_INFO, partProfileSchema, partsToCsv, type OpampParam } from "@/lib/schemas/part";
import { contentKeys } from "@/lib/workbench/row-ids";
import { fieldIssueText, scenarioIssueText, type FieldWords } from "@/lib/workbench/screen-words";

// Slew rates are typed and shown in V/µs (the unit every datasheet-reader thinks in); data stays SI.
const UI_SCALE: Partial<Record<OpampParam, { unit: string; factor: number }>> = {
  slewRate: { unit: "V/µs", factor: 1e6 },
  slewRateFall: { unit: "V/µs", factor: 1e6 },
};

function uiUnit(key: OpampParam): string {
  return UI_SCALE[key]?.unit ?? OPAMP_PARAM_INFO[key].unit;
}

function toText(key: OpampParam, value: number | undefined): string {
  if (value === undefined) return "";
  const scale = UI_SCALE[key];
  // Scaled units (V/µs) read as plain numbers: "0.05", not "50m".
  if (scale) return String(Number((value / scale.factor).toPrecision(4)));
  return formatQuantity(value, "", 4).replace(/\s+/g, "");
}

function show(key: OpampParam, value: number | undefined): string {
  if (value === undefined) return "—";
  if (key === "openLoopGain") return `${formatQuantity(value, "", 3).replace(/\s+/g, "")} V/V`;
  const scale = UI_SCALE[key];
  if (scale) return `${Number((value / scale.factor).toPrecision(3))} ${scale.unit}`;
  return formatQuantity(value, uiUnit(key));
}

type Draft = { name: string } & Record<OpampParam, string>;

/** Each form field's screen label, for the schema's messages (which name the contract's keys). */
function fieldWords(key: keyof Draft): FieldWords {
  if (key === "name") return { code: "name", label: "Name" };
  return { code: key, label: OPAMP_PARAM_INFO[key].label, scale: UI_SCALE[key] };
}

function draftOf(part?: PartProfileRecord): Draft {
  const d = { name: part?.name ?? "" } as Draft;
  for (const k of OPAMP_PARAMS) d[k] = part ? toText(k, part.opamp[k]) : "";
  return d;
}

/** Parse the form; returns field → message for anything wrong (the server checks again). */
function readDraft(d: Draft): { body?: unknown; errors: Partial<Record<keyof Draft, string>> } {
  const errors: Partial<Record<keyof Draft, string>> = {};
  const opamp: Record<string, number> = {};
  for (const k of OPAMP_PARAMS) {
    const text = d[k].trim();
    const label = OPAMP_PARAM_INFO[k].label;
    if (!text) {
      if (!OPAMP_PARAM_INFO[k].optional) errors[k] = `${label} is required`;
      continue;
    }
    const v = parseQuantity(text);
    if (v === null) {
      const why = quantityProblem(text);
      errors[k] =
        why === "not a value" ? `${label}: “${text}” is not a value (write e.g. 200k, 1M, 0.5)` : `${label}: ${why}`;
    } else opamp[k] = v * (UI_SCALE[k]?.factor ?? 1);
  }
  const body = { name: d.name, opamp };
  const r = partProfileSchema.safeParse(body);
  if (!r.success) {
    for (const issue of r.error.issues) {
      const at = issue.path[0] === "opamp" ? issue.path[1] : issue.path[0];
      // A message the schema gives the whole profile goes beside the name (nothing else fits).
      const key = (typeof at === "string" && at in d ? at : "name") as keyof Draft;
      if (!errors[key]) errors[key] = fieldIssueText(issue.message, fieldWords(key));
    }
  }
  return Object.keys(errors).length ? { errors } : { body, errors };
}

export function PartsView({ canEdit }: { canEdit: boolean }) {
  const { data, error, isLoading, mutate } = useParts();
  const [editing, setEditing] = useState<PartProfileRecord | "new" | null>(null);
  const [importing, setImporting] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);
  const items = data?.items ?? [];

  async function remove(p: PartProfileRecord) {
    if (!window.confirm(`Delete the part profile "${p.name}"? Scenarios keep the parameters they copied.`)) return;
    setProblem(null);
    try {
      await sendJson(`${partsKey}/${p.id}`, "DELETE");
      await mutate();
    } catch (err) {
      setProblem(errorMessage(err));
    }
  }

  function exportCsv() {
    const csv = partsToCsv(items.map((p) => ({ name: p.name, opamp: p.opamp })));
    const url = URL.createObjectURL(new Blob([csv], { type: "text/csv" }));
    const a = document.createElement("a");
    a.href = url;
    a.download = "railwise-parts.csv";
    a.click();
    URL.revokeObjectURL(url);
  }

  return (
    <div className="flex flex-col gap-4">
      <PageHeader
        title="Part library"
        description="Behavioural op-amp parameter sets of your team. Values are typed in engineering notation (200k, 1M, 2.5m)."
        actions={
          <>
            <Button
              size="sm"
              onClick={exportCsv}
              disabled={items.length === 0}
              title={items.length === 0 ? "The library is empty: nothing to export yet" : undefined}
            >
              Export CSV
            </Button>
            {canEdit && (
              <>
                <Button size="sm" onClick={() => setImporting(true)}>
                  Import CSV
                </Button>
                <Button size="sm" variant="primary" onClick={() => setEditing("new")}>
                  New profile
                </Button>
              </>
            )}
          </>
        }
      />
      {problem && (
        <p role="alert" className="text-[13px] text-alert">
          {problem}
        </p>
      )}
      <Card padded={false}>
        {error ? (
          <div className="p-4">
            <LoadError message={errorMessage(error)} onRetry={() => void mutate()} />
          </div>
        ) : isLoading ? (
          <LoadingRows />
        ) : items.length === 0 ? (
          <EmptyState title="No part profiles yet">
            {canEdit ? "Add one or import a CSV." : "Designers add them."}
          </EmptyState>
        ) : (
          <Table aria-label="Part profiles" stack>
            <THead>
              <TR>
                <TH>Name</TH>
                <TH numeric>Gain</TH>
                <TH numeric>GBW</TH>
                <TH numeric>Slew</TH>
                <TH numeric>Headroom +/−</TH>
                <TH numeric>Offset</TH>
                <TH numeric>Delay</TH>
                {canEdit && <TH className="text-right">Actions</TH>}
              </TR>
            </THead>
            <TBody>
              {items.map((p) => (
                <TR key={p.id}>
                  <TD className="font-medium">{p.name}</TD>
                  <TD numeric label="Gain">
                    {show("openLoopGain", p.opamp.openLoopGain)}
                  </TD>
                  <TD numeric label="GBW">
                    {show("gainBandwidth", p.opamp.gainBandwidth)}
                  </TD>
                  <TD numeric label="Slew">
                    {/* One wrapper: a stacked row (phone) lays each child out as its own item. */}
                    <span>
                      {show("slewRate", p.opamp.slewRate)}
                      {p.opamp.slewRateFall !== undefined && (
                        <span className="text-ink-mute"> / {show("slewRateFall", p.opamp.slewRateFall)}</span>
                      )}
                    </span>
                  </TD>
                  <TD numeric label="Headroom +/−">
                    {show("outputHeadroomHigh", p.opamp.outputHeadroomHigh)} /{" "}
                    {show("outputHeadroomLow", p.opamp.outputHeadroomLow)}
                  </TD>
                  <TD numeric label="Offset">
                    {show("inputOffset", p.opamp.inputOffset)}
                  </TD>
                  <TD numeric label="Delay">
                    {show("propagationDelay", p.opamp.propagationDelay)}
                  </TD>
                  {canEdit && (
                    <TD className="text-right whitespace-nowrap">
                      <Button size="sm" variant="ghost" onClick={() => setEditing(p)}>
                        Edit
                      </Button>
                      <Button size="sm" variant="danger" className="ml-1.5" onClick={() => void remove(p)}>
                        Delete
                      </Button>
                    </TD>
                  )}
                </TR>
              ))}
            </TBody>
          </Table>
        )}
      </Card>
      {editing && (
        <PartDialog
          part={editing === "new" ? undefined : editing}
          onClose={() => setEditing(null)}
          onSaved={async () => {
            setEditing(null);
            await mutate();
          }}
        />
      )}
      {importing && (
        <ImportDialog
          onClose={() => setImporting(false)}
          onImported={async () => {
            setImporting(false);
            await mutate();
          }}
        />
      )}
    </div>
  );
}

function PartDialog({
  part,
  onClose,
  onSaved,
}: {
  part?: PartProfileRecord;
  onClose: () => void;
  onSaved: () => Promise<void>;
}) {
  const [draft, setDraft] = useState<Draft>(() => draftOf(part));
  const [errors, setErrors] = useState<Partial<Record<keyof Draft, string>>>({});
  const [problem, setProblem] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  async function submit(e: FormEvent) {
    e.preventDefault();
    const { body, errors: found } = readDraft(draft);
    setErrors(found);
    if (!body) return;
    setBusy(true);
    setProblem(null);
    try {
      await sendJson(part ? `${partsKey}/${part.id}` : partsKey, part ? "PUT" : "POST", body);
      await onSaved();
    } catch (err) {
      setProblem(errorMessage(err));
      setBusy(false);
    }
  }

  const formId = "part-form";
  return (
    <Dialog
      open
      onClose={onClose}
      title={part ? `Edit ${part.name}` : "New part profile"}
      description="Generic behavioural parameters; use descriptive names, not manufacturer part numbers."
      footer={
        <>
          <Button onClick={onClose}>Cancel</Button>
          <Button type="submit" form={formId} variant="primary" disabled={busy}>
            {busy ? "Saving…" : "Save"}
          </Button>
        </>
      }
    >
      <form id={formId} onSubmit={submit} className="grid gap-3 sm:grid-cols-2">
        <Field label="Name" htmlFor="part-name" error={errors.name} className="sm:col-span-2">
          <TextInput
            id="part-name"
            value={draft.name}
            maxLength={80}
            onChange={(e) => setDraft({ ...draft, name: e.target.value })}
            aria-invalid={!!errors.name}
          />
        </Field>
        {OPAMP_PARAMS.map((k) => (
          <Field
            key={k}
            label={`${OPAMP_PARAM_INFO[k].label} (${uiUnit(k)})${OPAMP_PARAM_INFO[k].optional ? ", optional" : ""}`}
            htmlFor={`part-${k}`}
            error={errors[k]}
          >
            <TextInput
              id={`part-${k}`}
              className="font-mono"
              value={draft[k]}
              onChange={(e) => setDraft({ ...draft, [k]: e.target.value })}
              aria-invalid={!!errors[k]}
            />
          </Field>
        ))}
      </form>
      {problem && (
        <p role="alert" className="mt-3 text-[13px] text-alert">
          {problem}
        </p>
      )}
    </Dialog>
  );
}

function ImportDialog({ onClose, onImported }: { onClose: () => void; onImported: () => Promise<void> }) {
  const [file, setFile] = useState<File | null>(null);
  const [problems, setProblems] = useState<string[]>([]);
  const [busy, setBusy] = useState(false);

  async function submit() {
    if (!file) return;
    setBusy(true);
    setProblems([]);
    const form = new FormData();
    form.set("file", file);
    try {
      const res = await fetch(`${partsKey}/import`, { method: "POST", body: form, credentials: "same-origin" });
      const body = await res.json().catch(() => null);
      if (!res.ok) throw new HttpError(res.status, body);
      await onImported();
    } catch (err) {
      const issues =
        err instanceof HttpError && err.body && typeof err.body === "object" && Array.isArray(err.body.issues)
          ? err.body.issues
          : [];
      setProblems([
        err instanceof HttpError && typeof err.body === "object" && err.body?.message
          ? err.body.message
          : errorMessage(err),
        ...issues.map((i: { message?: string; path?: PropertyKey[] }) =>
          typeof i === "string" ? i : scenarioIssueText({ message: i.message ?? "", path: i.path }),
        ),
      ]);
      setBusy(false);
    }
  }

  return (
    <Dialog
      open
      onClose={onClose}
      title="Import part profiles"
      description={`A header row with name and any of: ${OPAMP_PARAMS.join(", ")} (SI units; 1M, 0.5u… accepted). All rows are checked; nothing is stored if one is wrong.`}
      footer={
        <>
          <Button onClick={onClose}>Cancel</Button>
          <Button
            variant="primary"
            onClick={() => void submit()}
            disabled={busy || !file}
            title={!file ? "Choose a CSV file first" : undefined}
          >
            {busy ? "Importing…" : "Import"}
          </Button>
        </>
      }
    >
      <input
        aria-label="Parts CSV"
        type="file"
        accept=".csv,text/csv"
        onChange={(e) => setFile(e.target.files?.[0] ?? null)}
        className="text-[13px]"
      />
      {problems.length > 0 && (
        <ul role="alert" className="mt-3 list-disc pl-5 text-[13px] text-alert">
          {contentKeys(problems).map((key, i) => (
            <li key={key}>{problems[i]}</li>
          ))}
        </ul>
      )}
    </Dialog>
  );
}

"use client";

import { useMemo, useState, type FormEvent } from "react";
import { Button } from "@/components/ui/button";
import { Field, Select, TextInput } from "@/components/ui/field";
import { Table, TBody, TD, TH, THead, TR } from "@/components/ui/table";
import { HttpError, errorMessage } from "@/lib/client/fetcher";
import {
  CAPTURE_MAX_BYTES,
  CaptureError,
  delimiterName,
  inspectCsv,
  parseCapture,
  TIME_UNIT_SCALE,
  type TimeUnit,
} from "@/lib/captures/parse";
import { CaptureSparkline } from "./capture-sparkline";
import { contentKeys } from "@/lib/workbench/row-ids";

interface Loaded {
  file: File;
  text: string;
  columns: string[];
  hasHeader: boolean;
  preview: string[][];
  rows: number;
  delimiter: string;
  decimalComma: boolean;
}

const UNIT_LABEL: Record<TimeUnit, string> = {
  s: "seconds",
  ms: "milliseconds",
  us: "microseconds",
  ns: "nanoseconds",
};

/** Guess the time unit from a header such as "t_ms" or "time (us)"; seconds otherwise. */
function unitFromHeader(name: string): TimeUnit {
  const m = /(?:^|[^a-z])(ms|us|µs|ns|s)(?:[^a-z]|$)/i.exec(name);
  const u = m?.[1]?.toLowerCase().replace("µs", "us");
  return u && u in TIME_UNIT_SCALE ? (u as TimeUnit) : "s";
}

/**
 * Upload a measured waveform: pick the CSV, choose the time and volts columns and the time
 * unit, see the parsed preview (same parser as the server), then store it for the team.
 */
export function CaptureUpload({ onUploaded }: { onUploaded: () => void }) {
  const [loaded, setLoaded] = useState<Loaded | null>(null);
  const [timeColumn, setTimeColumn] = useState(0);
  const [voltsColumn, setVoltsColumn] = useState(1);
  const [timeUnit, setTimeUnit] = useState<TimeUnit>("s");
  const [name, setName] = useState("");
  const [fileProblem, setFileProblem] = useState<string | null>(null);
  const [serverProblem, setServerProblem] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const [done, setDone] = useState<string | null>(null);

  async function pick(file: File | undefined) {
    setLoaded(null);
    setFileProblem(null);
    setServerProblem(null);
    setDone(null);
    if (!file) return;
    if (file.size > CAPTURE_MAX_BYTES) {
      setFileProblem(
        `The file is ${(file.size / (1024 * 1024)).toFixed(1)} MB; at most ${CAPTURE_MAX_BYTES / (1024 * 1024)} MB are accepted.`,
      );
      return;
    }
    const text = await file.text();
    try {
      const info = inspectCsv(text);
      setLoaded({ file, text, ...info });
      setTimeColumn(0);
      setVoltsColumn(Math.min(1, info.columns.length - 1));
      setTimeUnit(info.hasHeader ? unitFromHeader(info.columns[0]) : "s");
      setName(file.name.replace(/\.[^.]+$/, ""));
    } catch (err) {
      setFileProblem(err instanceof CaptureError ? err.message : errorMessage(err));
    }
  }

  const parsed = useMemo(() => {
    if (!loaded) return null;
    try {
      return {
        ok: true as const,
        capture: parseCapture(loaded.text, { timeColumn, voltsColumn, timeUnit, hasHeader: loaded.hasHeader }),
      };
    } catch (err) {
      return { ok: false as const, message: err instanceof Error ? err.message : String(err) };
    }
  }, [loaded, timeColumn, voltsColumn, timeUnit]);

  async function submit(e: FormEvent) {
    e.preventDefault();
    if (!loaded || !parsed?.ok) return;
    setBusy(true);
    setServerProblem(null);
    const form = new FormData();
    form.set("file", loaded.file);
    form.set("name", name);
    // Column numbers are 1-based for people; header names are sent as they are.
    form.set("timeColumn", loaded.hasHeader ? loaded.columns[timeColumn] : String(timeColumn + 1));
    form.set("voltsColumn", loaded.hasHeader ? loaded.columns[voltsColumn] : String(voltsColumn + 1));
    form.set("timeUnit", timeUnit);
    form.set("hasHeader", String(loaded.hasHeader));
    try {
      const res = await fetch("/api/captures", { method: "POST", body: form, credentials: "same-origin" });
      const body = await res.json().catch(() => null);
      if (!res.ok) throw new HttpError(res.status, body);
      setDone(`Stored "${body?.name ?? name}" (${parsed.capture.rows.toLocaleString("en")} points).`);
      setLoaded(null);
      onUploaded();
    } catch (err) {
      setServerProblem(errorMessage(err));
    } finally {
      setBusy(false);
    }
  }

  // The file's columns and first rows are only shown, never reordered: they key on their content.
  const columnKeys = useMemo(() => contentKeys(loaded?.columns ?? []), [loaded]);
  const rowKeys = useMemo(() => contentKeys(loaded?.preview ?? [], (r) => r.join("\t")), [loaded]);

  return (
    <form onSubmit={submit} className="flex flex-col gap-3" aria-label="Upload a capture">
      <Field
        label="CSV file"
        htmlFor="capture-file"
        hint="Columns of numbers, one row per sample; time strictly increasing. Up to 5 MB and 200,000 rows."
        error={fileProblem}
      >
        <input
          id="capture-file"
          type="file"
          accept=".csv,text/csv,text/plain"
          onChange={(e) => void pick(e.target.files?.[0])}
          className="text-[13px] file:mr-3 file:h-8 file:rounded-md file:border file:border-paper-line file:bg-paper-card file:px-3 file:text-[13px] file:font-medium hover:file:bg-paper-sunk"
        />
      </Field>

      {loaded && (
        <>
          <div className="grid gap-3 sm:grid-cols-4">
            <Field label="Name" htmlFor="capture-name">
              <TextInput id="capture-name" value={name} maxLength={120} onChange={(e) => setName(e.target.value)} />
            </Field>
            <Field label="Time column" htmlFor="capture-time">
              <Select id="capture-time" value={timeColumn} onChange={(e) => setTimeColumn(Number(e.target.value))}>
                {loaded.columns.map((c, i) => (
                  <option key={columnKeys[i]} value={i}>
                    {c}
                  </option>
                ))}
              </Select>
            </Field>
            <Field label="Time unit" htmlFor="capture-unit">
              <Select id="capture-unit" value={timeUnit} onChange={(e) => setTimeUnit(e.target.value as TimeUnit)}>
                {(Object.keys(UNIT_LABEL) as TimeUnit[]).map((u) => (
                  <option key={u} value={u}>
                    {UNIT_LABEL[u]}
                  </option>
                ))}
              </Select>
            </Field>
            <Field label="Volts column" htmlFor="capture-volts">
              <Select id="capture-volts" value={voltsColumn} onChange={(e) => setVoltsColumn(Number(e.target.value))}>
                {loaded.columns.map((c, i) => (
                  <option key={columnKeys[i]} value={i}>
                    {c}
                  </option>
                ))}
              </Select>
            </Field>
          </div>

          <div className="rounded-md border border-paper-line">
            <Table aria-label="First rows of the file">
              <THead>
                <TR>
                  {loaded.columns.map((c, i) => (
                    <TH
                      key={columnKeys[i]}
                      numeric
                      className={i === timeColumn ? "text-indigo" : i === voltsColumn ? "text-copper" : undefined}
                    >
                      {c}
                    </TH>
                  ))}
                </TR>
              </THead>
              <TBody>
                {loaded.preview.map((row, r) => (
                  <TR key={rowKeys[r]}>
                    {loaded.columns.map((_, i) => (
                      <TD
                        key={columnKeys[i]}
                        numeric
                        className={i === timeColumn || i === voltsColumn ? "text-ink" : "text-ink-faint"}
                      >
                        {row[i] ?? ""}
                      </TD>
                    ))}
                  </TR>
                ))}
              </TBody>
            </Table>
            <p className="border-t border-paper-line px-3 py-1.5 text-[12px] text-ink-mute">
              First {loaded.preview.length} of {loaded.rows.toLocaleString("en")} data rows
              {loaded.hasHeader ? " (header row detected)" : " (no header row)"}.{" "}
              <span data-testid="capture-detected">
                Detected: {delimiterName(loaded.delimiter)}-separated
                {loaded.decimalComma ? ", decimal commas (1,5 = 1.5)" : ""}.
              </span>
            </p>
          </div>

          {parsed?.ok ? (
            <CaptureSparkline samples={parsed.capture.samples} label={`Preview of ${name}`} />
          ) : (
            <p
              role="alert"
              className="rounded-md border border-alert/30 bg-alert-soft px-3 py-2 text-[13px] text-alert"
            >
              {parsed?.message}
            </p>
          )}

          <div className="flex justify-end gap-2">
            <Button onClick={() => setLoaded(null)}>Cancel</Button>
            <Button type="submit" variant="primary" disabled={busy || !parsed?.ok}>
              {busy ? "Uploading…" : "Store capture"}
            </Button>
          </div>
        </>
      )}
      {serverProblem && (
        <p role="alert" className="text-[13px] text-alert">
          {serverProblem}
        </p>
      )}
      {done && (
        <p role="status" className="text-[13px] text-moss">
          {done}
        </p>
      )}
    </form>
  );
}

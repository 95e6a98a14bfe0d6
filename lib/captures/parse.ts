// Parse a measured waveform (CSV) into `[t, v]` samples for a `capture` input component.
// Pure: no I/O, no framework. The user picks the time and volts columns; every refusal
// names the row and column so the file can be fixed.
import Papa from "papaparse";

export const CAPTURE_MAX_BYTES = 5 * 1024 * 1024;
export const CAPTURE_MAX_ROWS = 200_000;
// Inputs of the scenario contract are bounded to ±1000 V (lib/schemas/scenario.ts).
const MAX_ABS_VOLTS = 1000;

export type TimeUnit = "s" | "ms" | "us" | "ns";
export const TIME_UNIT_SCALE: Record<TimeUnit, number> = { s: 1, ms: 1e-3, us: 1e-6, ns: 1e-9 };

/** A column chosen by header name, or by 0-based index when the file has no header row. */
export type ColumnRef = string | number;

export interface CaptureParseOptions {
  timeColumn: ColumnRef;
  voltsColumn: ColumnRef;
  /** Default: detected (first row has a non-numeric cell in a chosen column). */
  hasHeader?: boolean;
  timeUnit?: TimeUnit;
  maxRows?: number;
}

export interface ParsedCapture {
  samples: [number, number][];
  /** The column separator detected in the file (papaparse's guess over the first rows). */
  delimiter: string;
  /** True when numbers were written with a decimal comma ("1,5"), accepted because the separator is not a comma. */
  decimalComma: boolean;
  columns: string[];
  timeColumn: string;
  voltsColumn: string;
  rows: number;
  duration: number;
  min: number;
  max: number;
}

/** Why a capture was refused: the file is too big ("too_large") or not a usable capture ("invalid"). */
export type CaptureErrorCode = "invalid" | "too_large";

export class CaptureError extends Error {
  constructor(
    message: string,
    readonly field: string = "file",
    readonly code: CaptureErrorCode = "invalid",
  ) {
    super(message);
    this.name = "CaptureError";
  }
}

/** Strict decimal number (plain or exponent form); "", "NaN", "12V" are refused. */
const NUMBER_RE = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;
/** The same with a decimal comma ("1,5", "-0,25e-3"): accepted only when the separator is not a comma. */
const COMMA_NUMBER_RE = /^[+-]?(\d+,?\d*|,\d+)([eE][+-]?\d+)?$/;

/** Readable name of a separator, for the "detected" line. */
export function delimiterName(d: string): string {
  return d === ","
    ? "comma"
    : d === ";"
      ? "semicolon"
      : d === "\t"
        ? "tab"
        : d === "|"
          ? "vertical bar"
          : d === " "
            ? "space"
            : `"${d}"`;
}

function toNumber(cell: string | undefined, decimalComma = false): number | null {
  if (cell === undefined) return null;
  let text = cell.trim();
  if (decimalComma && text.includes(",") && !text.includes(".") && COMMA_NUMBER_RE.test(text))
    text = text.replace(",", ".");
  if (!NUMBER_RE.test(text)) return null;
  const n = Number(text);
  return Number.isFinite(n) ? n : null;
}

function readRows(text: string): { rows: string[][]; delimiter: string } {
  if (text.length === 0 || text.trim().length === 0) throw new CaptureError("The file is empty.");
  // NUL bytes or undecodable bytes: a spreadsheet or scope binary, not a CSV export.
  if (/[\u0000\uFFFD]/.test(text.slice(0, 65536)))
    throw new CaptureError("The file is not a text CSV (it contains binary data); export it as CSV.");
  // Papaparse guesses the separator (comma, tab, vertical bar, semicolon) from the first rows.
  const parsed = Papa.parse<string[]>(text.replace(/^\uFEFF/, ""), {
    skipEmptyLines: "greedy",
    dynamicTyping: false,
    delimitersToGuess: [",", ";", "\t", "|"],
  });
  const fatal = parsed.errors.find((e) => e.type === "Quotes");
  if (fatal) throw new CaptureError(`Row ${(fatal.row ?? 0) + 1}: ${fatal.message}.`);
  const rows = parsed.data.filter((r) => Array.isArray(r) && r.some((c) => c.trim() !== ""));
  if (rows.length === 0) throw new CaptureError("The file is empty.");
  return { rows, delimiter: parsed.meta.delimiter || "," };
}

/** Decimal commas are possible only when the separator is something else; seen in any data cell. */
function usesDecimalComma(rows: string[][], delimiter: string): boolean {
  if (delimiter === ",") return false;
  return rows.slice(0, 200).some((r) => r.some((c) => /\d,\d/.test(c) && COMMA_NUMBER_RE.test(c.trim())));
}

function looksLikeHeader(row: string[], decimalComma = false): boolean {
  return row.some((c) => c.trim() !== "" && toNumber(c, decimalComma) === null);
}

function columnNames(rows: string[][], hasHeader: boolean): string[] {
  const width = Math.max(...rows.slice(0, 50).map((r) => r.length));
  if (hasHeader) return rows[0].map((c, i) => c.trim() || `column ${i + 1}`);
  return Array.from({ length: width }, (_, i) => `column ${i + 1}`);
}

function resolveColumn(ref: ColumnRef, names: string[], field: string, hasHeader: boolean): number {
  if (typeof ref === "number" || (/^\d+$/.test(String(ref).trim()) && !names.includes(String(ref)))) {
    const index = Number(ref);
    if (!Number.isInteger(index) || index < 0 || index >= names.length) {
      throw new CaptureError(`${field}: column ${index + 1} does not exist (the file has ${names.length}).`, field);
    }
    return index;
  }
  const name = String(ref).trim();
  const index = names.indexOf(name);
  if (index < 0) {
    const known = names.map((n) => `"${n}"`).join(", ");
    throw new CaptureError(
      hasHeader
        ? `${field}: no column named "${name}" (columns: ${known}).`
        : `${field}: the file has no header row; choose a column by number.`,
      field,
    );
  }
  return index;
}

/** Columns and the first rows, for the column chooser and the preview before upload. */
export function inspectCsv(
  text: string,
  previewRows = 8,
): {
  columns: string[];
  hasHeader: boolean;
  preview: string[][];
  rows: number;
  delimiter: string;
  decimalComma: boolean;
} {
  const { rows, delimiter } = readRows(text);
  const decimalComma = usesDecimalComma(rows, delimiter);
  const hasHeader = looksLikeHeader(rows[0], decimalComma);
  const columns = columnNames(rows, hasHeader);
  const body = hasHeader ? rows.slice(1) : rows;
  return { columns, hasHeader, preview: body.slice(0, previewRows), rows: body.length, delimiter, decimalComma };
}

export function parseCapture(text: string, options: CaptureParseOptions): ParsedCapture {
  if (text.length > CAPTURE_MAX_BYTES) {
    throw new CaptureError(`The file is larger than ${CAPTURE_MAX_BYTES / (1024 * 1024)} MB.`, "file", "too_large");
  }
  const { rows, delimiter } = readRows(text);
  const decimalComma = usesDecimalComma(rows, delimiter);
  const hasHeader = options.hasHeader ?? looksLikeHeader(rows[0], decimalComma);
  const names = columnNames(rows, hasHeader);
  if (names.length < 2) {
    throw new CaptureError(
      "The file has only one column: a capture needs a time column and a volts column, separated by a comma, semicolon, tab or vertical bar.",
    );
  }
  const ti = resolveColumn(options.timeColumn, names, "timeColumn", hasHeader);
  const vi = resolveColumn(options.voltsColumn, names, "voltsColumn", hasHeader);
  if (ti === vi)
    throw new CaptureError(
      `Volts column: choose a different column from the time column (both are "${names[ti]}").`,
      "voltsColumn",
    );

  const first = hasHeader ? 1 : 0;
  const count = rows.length - first;
  const maxRows = options.maxRows ?? CAPTURE_MAX_ROWS;
  if (count === 0) throw new CaptureError("The file has a header row but no data rows.");
  if (count < 2) throw new CaptureError("A capture needs at least 2 data rows.");
  if (count > maxRows) {
    throw new CaptureError(
      `The file has ${count.toLocaleString("en")} data rows; at most ${maxRows.toLocaleString("en")} are accepted.`,
      "file",
      "too_large",
    );
  }

  const scale = TIME_UNIT_SCALE[options.timeUnit ?? "s"];
  if (scale === undefined) throw new CaptureError("timeUnit must be one of s, ms, us, ns.", "timeUnit");
  const samples: [number, number][] = new Array(count);
  let min = Infinity;
  let max = -Infinity;
  for (let r = first; r < rows.length; r++) {
    const row = rows[r];
    const line = r + 1; // 1-based line in the file, counting the header
    const t = toNumber(row[ti], decimalComma);
    if (t === null) {
      throw new CaptureError(
        `Row ${line}, column "${names[ti]}": "${(row[ti] ?? "").trim()}" is not a number.`,
        "timeColumn",
      );
    }
    const v = toNumber(row[vi], decimalComma);
    if (v === null) {
      throw new CaptureError(
        `Row ${line}, column "${names[vi]}": "${(row[vi] ?? "").trim()}" is not a number.`,
        "voltsColumn",
      );
    }
    if (Math.abs(v) > MAX_ABS_VOLTS) {
      throw new CaptureError(
        `Row ${line}, column "${names[vi]}": ${v} V is outside ±${MAX_ABS_VOLTS} V.`,
        "voltsColumn",
      );
    }
    const ts = t * scale;
    const i = r - first;
    if (i > 0 && !(ts > samples[i - 1][0])) {
      throw new CaptureError(
        `Row ${line}, column "${names[ti]}": time ${t} is not after the previous row's ${samples[i - 1][0] / scale}; time must be strictly increasing.`,
        "timeColumn",
      );
    }
    samples[i] = [ts, v];
    if (v < min) min = v;
    if (v > max) max = v;
  }
  return {
    samples,
    delimiter,
    decimalComma,
    columns: names,
    timeColumn: names[ti],
    voltsColumn: names[vi],
    rows: count,
    duration: samples[count - 1][0] - samples[0][0],
    min,
    max,
  };
}

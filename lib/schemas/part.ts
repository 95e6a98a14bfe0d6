// Part profile: a named set of behavioural op-amp parameters (lib/schemas/README.md § Part profile).
// The parameters are exactly the scenario's `opamp` object, validated by the same schema,
// so a profile drops straight into a scenario.
import { z } from "zod";
import Papa from "papaparse";
import { opampSchema, describeIssues } from "./scenario";
import { parseQuantity } from "../design/notation";

export const PART_NAME_MAX = 80;

export const partNameSchema = z
  .string({ error: "name must be text" })
  .trim()
  .min(1, { message: "name must not be empty" })
  .max(PART_NAME_MAX, { message: `name must be at most ${PART_NAME_MAX} characters` });

export const partProfileSchema = z.object({
  name: partNameSchema,
  opamp: opampSchema,
});

export type PartProfileInput = z.infer<typeof partProfileSchema>;

export const OPAMP_PARAMS = [
  "openLoopGain",
  "gainBandwidth",
  "slewRate",
  "slewRateFall",
  "outputHeadroomHigh",
  "outputHeadroomLow",
  "inputOffset",
  "propagationDelay",
] as const;
export type OpampParam = (typeof OPAMP_PARAMS)[number];

/** Units in SI data, and the friendlier unit the forms show. */
export const OPAMP_PARAM_INFO: Record<OpampParam, { label: string; unit: string; optional?: boolean }> = {
  openLoopGain: { label: "Open-loop gain", unit: "V/V" },
  gainBandwidth: { label: "Gain-bandwidth", unit: "Hz" },
  slewRate: { label: "Slew rate (rising)", unit: "V/s" },
  slewRateFall: { label: "Slew rate (falling)", unit: "V/s", optional: true },
  outputHeadroomHigh: { label: "Headroom to V+", unit: "V" },
  outputHeadroomLow: { label: "Headroom to V−", unit: "V" },
  inputOffset: { label: "Input offset", unit: "V" },
  propagationDelay: { label: "Propagation delay", unit: "s", optional: true },
};

/**
 * Accept `{ name, opamp: {...} }` (canonical), `{ name, params: {...} }` (the stored shape) or the
 * parameters flat beside the name; every form is validated by the same schema.
 */
export const partProfileBodySchema = z.preprocess((raw) => {
  if (!raw || typeof raw !== "object" || Array.isArray(raw)) return raw;
  const body = raw as Record<string, unknown>;
  if (body.opamp !== undefined) return { name: body.name, opamp: body.opamp };
  if (body.params !== undefined) return { name: body.name, opamp: body.params };
  const opamp: Record<string, unknown> = {};
  for (const key of OPAMP_PARAMS) if (body[key] !== undefined) opamp[key] = body[key];
  return { name: body.name, opamp };
}, partProfileSchema);

export const PART_CSV_MAX_BYTES = 256 * 1024;
export const PART_CSV_MAX_ROWS = 500;

export interface PartCsvResult {
  parts: PartProfileInput[];
  errors: string[];
}

/**
 * CSV import: a header row with `name` and the parameter names of the opamp object
 * (SI units; engineering notation such as 1M, 10u or 2.2n is accepted). Every row is
 * validated; `errors` names the row and field of each problem, and callers store nothing
 * when there is any error.
 */
export function parsePartsCsv(text: string): PartCsvResult {
  if (text.length > PART_CSV_MAX_BYTES)
    return { parts: [], errors: [`The file is larger than ${PART_CSV_MAX_BYTES / 1024} KB.`] };
  if (!text.trim()) return { parts: [], errors: ["The file is empty."] };
  const parsed = Papa.parse<Record<string, string>>(text.replace(/^\uFEFF/, ""), {
    header: true,
    skipEmptyLines: "greedy",
    transformHeader: (h) => h.trim(),
  });
  const headers = parsed.meta.fields ?? [];
  const errors: string[] = [];
  if (!headers.includes("name")) errors.push('The header row must contain a "name" column.');
  const unknown = headers.filter((h) => h !== "name" && !(OPAMP_PARAMS as readonly string[]).includes(h));
  if (unknown.length) errors.push(`Unknown column(s): ${unknown.join(", ")}. Known: name, ${OPAMP_PARAMS.join(", ")}.`);
  if (errors.length) return { parts: [], errors };
  if (parsed.data.length === 0) return { parts: [], errors: ["The file has a header row but no parts."] };
  if (parsed.data.length > PART_CSV_MAX_ROWS)
    return { parts: [], errors: [`At most ${PART_CSV_MAX_ROWS} parts per file.`] };

  const parts: PartProfileInput[] = [];
  const seen = new Set<string>();
  parsed.data.forEach((row, index) => {
    const line = index + 2; // header is line 1
    const opamp: Record<string, unknown> = {};
    for (const key of OPAMP_PARAMS) {
      const cell = (row[key] ?? "").trim();
      if (cell === "") continue;
      const value = parseQuantity(cell);
      if (value === null || !Number.isFinite(value)) {
        errors.push(`Row ${line}, ${key}: "${cell}" is not a number.`);
        return;
      }
      opamp[key] = value;
    }
    const result = partProfileSchema.safeParse({ name: row.name ?? "", opamp });
    if (!result.success) {
      for (const issue of describeIssues(result.error)) errors.push(`Row ${line}, ${issue.replace(/^opamp\./, "")}`);
      return;
    }
    const key = result.data.name.toLowerCase();
    if (seen.has(key)) {
      errors.push(`Row ${line}, name: "${result.data.name}" appears twice in the file.`);
      return;
    }
    seen.add(key);
    parts.push(result.data);
  });
  return { parts: errors.length ? [] : parts, errors };
}

/** The CSV the library page offers as a template (and the export of the current library). */
export function partsToCsv(parts: PartProfileInput[]): string {
  return Papa.unparse({
    fields: ["name", ...OPAMP_PARAMS],
    data: parts.map((p) => [p.name, ...OPAMP_PARAMS.map((k) => (p.opamp[k] === undefined ? "" : String(p.opamp[k])))]),
  });
}

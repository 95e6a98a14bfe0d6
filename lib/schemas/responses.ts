// Response schemas: the JSON the API answers with, the one place these shapes are declared.
// The SWR hooks (lib/client) take their types from here with z.infer; see lib/schemas/README.md.
import { z } from "zod";
import { opampSchema } from "./scenario";
import { finite, nonNegative } from "./units";

const isoTime = z.iso.datetime({ offset: true });
const id = z.string().min(1);

/** Every list route answers `{ items: [...] }`. */
export const listOf = <T extends z.ZodType>(item: T) => z.strictObject({ items: z.array(item) });

/** GET /api/captures items: a measured waveform without its samples. */
export const captureSummarySchema = z.strictObject({
  id,
  name: z.string(),
  sourceFilename: z.string().nullable(),
  columns: z.strictObject({ time: z.string(), value: z.string() }),
  points: z.number().int().nonnegative(),
  start: finite("start"),
  duration: nonNegative("duration"),
  min: finite("min"),
  max: finite("max"),
  createdBy: z.string().nullable(),
  createdAt: isoTime,
});

/** GET /api/captures/:id and POST /api/captures: the summary plus [[t, v], ...] in s and V. */
export const captureSchema = captureSummarySchema.extend({
  samples: z.array(z.tuple([finite("sample time"), finite("sample value")])),
});

/** GET /api/team/audit items. `details` is free-form per action. */
export const auditEntrySchema = z.strictObject({
  id,
  action: z.string(),
  actorId: z.string().nullable(),
  actorName: z.string().nullable(),
  targetType: z.string().nullable(),
  targetId: z.string().nullable(),
  /** What the entry is about, in words: the member's name, or the run's label and scenario. */
  targetName: z.string().nullable(),
  details: z.unknown(),
  createdAt: isoTime,
});

/** GET /api/parts items, GET/PUT /api/parts/:id, POST /api/parts: a named op-amp parameter set. */
export const partProfileJsonSchema = z.strictObject({
  id,
  name: z.string(),
  opamp: opampSchema,
  createdBy: z.string().nullable(),
  createdAt: isoTime,
  updatedAt: isoTime,
});

export type ListOf<T> = { items: T[] };
export type CaptureSummaryJson = z.infer<typeof captureSummarySchema>;
export type CaptureJson = z.infer<typeof captureSchema>;
export type AuditJson = z.infer<typeof auditEntrySchema>;
export type PartProfileJson = z.infer<typeof partProfileJsonSchema>;

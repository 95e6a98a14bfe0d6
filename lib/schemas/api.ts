// Request bodies of the boards, scenarios and runs API (DEVELOPERS.md § HTTP API).
// Shared by the route handlers and the client forms.
import { z } from "zod";
import { scenarioSchema } from "./scenario";

const name = (what: string) =>
  z
    .string({ error: `${what} must be text` })
    .trim()
    .min(1, { message: `${what} must not be empty` })
    .max(120, { message: `${what} must be at most 120 characters` });

const description = z
  .string({ error: "description must be text" })
  .trim()
  .max(2000, { message: "description must be at most 2000 characters" });

export const boardCreateSchema = z.object({ name: name("name"), description: description.default("") });

export const boardPatchSchema = z
  .strictObject({ name: name("name").optional(), description: description.optional() })
  .refine((b) => b.name !== undefined || b.description !== undefined, {
    message: "send name or description to change",
  });

export const scenarioCreateSchema = z.object({
  boardId: z.string({ error: "boardId must be a board id" }).min(1, { message: "boardId must be a board id" }),
  name: name("name").optional(),
  scenario: scenarioSchema,
});

/** PUT stores a new version. `baseVersion` (optional) makes a stale editor's save a 409. */
export const scenarioUpdateSchema = z
  .strictObject({
    name: name("name").optional(),
    scenario: scenarioSchema.optional(),
    note: z
      .string({ error: "note must be text" })
      .trim()
      .max(500, { message: "note must be at most 500 characters" })
      .optional(),
    baseVersion: z.number({ error: "baseVersion must be a version number" }).int().min(1).optional(),
  })
  .refine((b) => b.name !== undefined || b.scenario !== undefined, { message: "send scenario or name to save" });

export const runCreateSchema = z.object({
  scenarioId: z
    .string({ error: "scenarioId must be a scenario id" })
    .min(1, { message: "scenarioId must be a scenario id" }),
  label: z
    .string({ error: "label must be text" })
    .trim()
    .max(200, { message: "label must be at most 200 characters" })
    .optional(),
});

export type BoardCreate = z.infer<typeof boardCreateSchema>;
export type BoardPatch = z.infer<typeof boardPatchSchema>;
export type ScenarioCreate = z.infer<typeof scenarioCreateSchema>;
export type ScenarioUpdate = z.infer<typeof scenarioUpdateSchema>;
export type RunCreate = z.infer<typeof runCreateSchema>;

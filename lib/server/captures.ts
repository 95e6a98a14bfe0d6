import "server-only";
import { getModels } from "@/models";
import { notFound } from "@/lib/server/errors";
import { isId } from "@/lib/server/ids";
import { deleteAudited } from "@/lib/server/audit";
import type { ParsedCapture } from "@/lib/captures/parse";
import type { CaptureJson, CaptureSummaryJson } from "@/lib/schemas/responses";
export type { CaptureJson, CaptureSummaryJson };

// Measured waveforms uploaded as CSV, kept as [[t, v], ...] (s, V) for `capture` input components.

type CaptureRow = {
  id: string;
  name: string;
  samples?: unknown;
  columns: unknown;
  sourceFilename: string | null;
  createdBy: unknown;
  createdAt: Date;
};

/** Stored in the row's `columns` JSON beside the column names, so lists need not load the samples. */
interface CaptureColumns {
  time: string;
  value: string;
  stats?: { points: number; start: number; duration: number; min: number; max: number };
}

function statsOf(samples: [number, number][]): NonNullable<CaptureColumns["stats"]> {
  let min = Infinity;
  let max = -Infinity;
  for (const [, v] of samples) {
    if (v < min) min = v;
    if (v > max) max = v;
  }
  const n = samples.length;
  return n
    ? { points: n, start: samples[0][0], duration: samples[n - 1][0] - samples[0][0], min, max }
    : { points: 0, start: 0, duration: 0, min: 0, max: 0 };
}

function captureJson(row: CaptureRow, samples?: [number, number][]): CaptureSummaryJson | CaptureJson {
  const columns = row.columns as CaptureColumns;
  const stats = samples ? statsOf(samples) : (columns.stats ?? { points: 0, start: 0, duration: 0, min: 0, max: 0 });
  const summary: CaptureSummaryJson = {
    id: row.id,
    name: row.name,
    sourceFilename: row.sourceFilename,
    columns: { time: columns.time, value: columns.value },
    ...stats,
    createdBy: (row.createdBy as string | null) ?? null,
    createdAt: new Date(row.createdAt).toISOString(),
  };
  return samples ? { ...summary, samples } : summary;
}

export async function listCaptures({ teamId }: { teamId: string }): Promise<CaptureSummaryJson[]> {
  const rows = await getModels().Capture.findAll({
    where: { teamId },
    attributes: { exclude: ["samples"] },
    order: [
      ["createdAt", "DESC"],
      ["id", "ASC"],
    ],
  });
  return Promise.all(
    rows.map(async (r) => {
      if ((r.columns as CaptureColumns)?.stats) return captureJson(r);
      // Rows stored without stats (e.g. by the seed): read the samples once to describe them.
      const full = await getModels().Capture.findByPk(r.id, { attributes: ["samples"] });
      return captureJson(r, (full?.samples as [number, number][]) ?? []);
    }),
  ).then((items) => items.map(({ samples: _omit, ...summary }: CaptureSummaryJson & { samples?: unknown }) => summary));
}

export async function getCaptureOrThrow({ id, teamId }: { id: string; teamId: string }): Promise<CaptureJson> {
  const row = isId(id) ? await getModels().Capture.findOne({ where: { id, teamId } }) : null;
  if (!row) throw notFound("No such capture in your team.");
  return captureJson(row, row.samples as [number, number][]) as CaptureJson;
}

export async function createCapture({
  teamId,
  actorId,
  name,
  sourceFilename,
  parsed,
}: {
  teamId: string;
  actorId: string;
  name: string;
  sourceFilename: string | null;
  parsed: ParsedCapture;
}): Promise<CaptureJson> {
  const row = await getModels().Capture.create({
    teamId,
    name,
    samples: parsed.samples,
    columns: {
      time: parsed.timeColumn,
      value: parsed.voltsColumn,
      stats: statsOf(parsed.samples),
    } satisfies CaptureColumns,
    sourceFilename,
    createdBy: actorId,
  });
  return captureJson(row, parsed.samples) as CaptureJson;
}

export async function deleteCapture({
  id,
  teamId,
  actorId,
}: {
  id: string;
  teamId: string;
  actorId: string;
}): Promise<void> {
  await deleteAudited({
    id,
    teamId,
    actorId,
    what: "capture",
    action: "capture.deleted",
    targetType: "capture",
    find: (transaction) =>
      getModels().Capture.findOne({ where: { id, teamId }, attributes: ["id", "name"], transaction }),
    details: (row) => ({ name: row.name }),
  });
}

import "server-only";
// Ids are UUID strings; anything else cannot name a row, so it is a 404 before any query
// (PostgreSQL would otherwise raise a cast error on a malformed uuid).
import { notFound } from "./errors";

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

export const isId = (value: unknown): value is string => typeof value === "string" && UUID.test(value);

/**
 * The one check every dynamic API route applies to its id segments before any query: a UUID
 * comes back lower-cased; anything else (NUL, undecodable bytes such as %ff%fe, an oversized
 * segment, another shape) names no row, so it is a 404 saying which kind of item.
 */
export function requireId(value: unknown, what = "item"): string {
  if (!isId(value)) throw notFound(`No such ${what} in your team.`);
  return value.toLowerCase();
}

/** The `id`-like segments of a route's params, each through requireId. */
export async function routeIds<P extends Record<string, string>, K extends keyof P & string>(
  params: Promise<P>,
  what: Record<K, string>,
): Promise<Record<K, string>> {
  const raw = await params;
  const out = {} as Record<K, string>;
  for (const key of Object.keys(what) as K[]) out[key] = requireId(raw[key], what[key]);
  return out;
}

export const iso = (d: Date | string | null | undefined): string | null => (d ? new Date(d).toISOString() : null);

import type { PersonJson } from "@/lib/schemas/responses";

export type { PersonJson };

export function person(id: unknown, row: { name?: string | null } | null | undefined): PersonJson {
  if (typeof id !== "string") return null;
  return { id, name: row?.name ?? "(removed account)" };
}

/** A version number from a URL segment; anything else names no version (404). */
export function versionNumber(text: string): number {
  const n = Number(text);
  if (!/^\d{1,9}$/.test(text) || n < 1) throw notFound(`There is no version "${text}".`);
  return n;
}

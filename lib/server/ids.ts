import "server-only";
// Ids are UUID strings; anything else cannot name a row, so it is a 404 before any query
// (PostgreSQL would otherwise raise a cast error on a malformed uuid).
import { notFound } from "./errors";

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

export const isId = (value: unknown): value is string => typeof value === "string" && UUID.test(value);

export const iso = (d: Date | string | null | undefined): string | null => (d ? new Date(d).toISOString() : null);

export type PersonJson = { id: string; name: string } | null;

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

// Showing the people named on stored objects (lib/schemas/responses.ts: personSchema, memberRefSchema).
import type { MemberRefJson, PersonJson } from "@/lib/schemas/responses";

/** A user named on a stored object, or null. */
export type PersonRef = PersonJson;

/** Display name of a person ("—" when none was recorded). */
export function personName(p: PersonJson | MemberRefJson | undefined): string {
  if (!p) return "—";
  return p.name || p.id || "—";
}

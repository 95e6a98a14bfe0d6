// Request bodies of the team side (members, invitations, run links, comments, sign-offs).
// Shared by the route handlers and the client forms.
import { z } from "zod";
import { DECISIONS, ROLES, roleSchema, type Decision, type Role } from "./roles";

export { roleSchema };
export const ROLE_NAMES = ROLES;
export type RoleName = Role;
export type DecisionName = Decision;

export const COMMENT_MAX = 2000;
export const NOTE_MAX = 2000;
export const PASSWORD_MIN = 10;
export const INVITATION_TTL_HOURS = 72;
export const LINK_MAX_DAYS = 365;

export const roleChangeSchema = z.object({ role: roleSchema });

export const emailSchema = z
  .string({ error: "email must be text" })
  .trim()
  .toLowerCase()
  .max(254, { message: "email must be at most 254 characters" })
  .pipe(z.email({ message: "email must be an e-mail address" }));

export const invitationCreateSchema = z.object({ email: emailSchema, role: roleSchema });

export const personNameSchema = z
  .string({ error: "name must be text" })
  .trim()
  .min(1, { message: "name must not be empty" })
  .max(100, { message: "name must be at most 100 characters" });

export const passwordSchema = z
  .string({ error: "password must be text" })
  .min(PASSWORD_MIN, { message: `password must be at least ${PASSWORD_MIN} characters` })
  .max(200, { message: "password must be at most 200 characters" });

export const invitationAcceptSchema = z.object({ name: personNameSchema, password: passwordSchema });

// Plain text only: control characters other than newline and tab are dropped; nothing is
// interpreted as markup (React escapes on display, mails are text/plain).
const plainText = (field: string, max: number, min: number) =>
  z
    .string({ error: `${field} must be text` })
    .transform((s) =>
      s
        .replace(/\r\n?/g, "\n")
        .replace(/[\u0000-\u0008\u000b-\u001f\u007f]/g, "")
        .trim(),
    )
    .pipe(
      z
        .string()
        .min(min, { message: `${field} must not be empty` })
        .max(max, { message: `${field} must be at most ${max} characters` }),
    );

/** `{ body }`; `{ text }` is read as the same field. */
export const commentCreateSchema = z.preprocess(
  (raw) =>
    raw && typeof raw === "object" && !("body" in raw) && "text" in raw
      ? { body: (raw as { text: unknown }).text }
      : raw,
  z.object({ body: plainText("body", COMMENT_MAX, 1) }),
);

export const signoffCreateSchema = z.object({
  // "changes-requested" is read as "changes_requested" (both spellings circulate in clients).
  decision: z.preprocess(
    (d) => (d === "changes-requested" ? "changes_requested" : d),
    z.enum(DECISIONS, { error: 'decision must be "approved" or "changes_requested"' }),
  ),
  note: plainText("note", NOTE_MAX, 0).default(""),
});

/** Optional expiry: an ISO date-time in the future, or a number of days (≤ LINK_MAX_DAYS). */
export const linkCreateSchema = z
  .object({
    expiresAt: z.iso
      .datetime({ offset: true, message: "expiresAt must be an ISO date-time such as 2030-01-31T12:00:00Z" })
      .nullable()
      .optional(),
    expiresInDays: z
      .number({ error: "expiresInDays must be a number" })
      .positive({ message: "expiresInDays must be greater than 0" })
      .max(LINK_MAX_DAYS, { message: `expiresInDays must be at most ${LINK_MAX_DAYS}` })
      .optional(),
  })
  .refine((b) => !(b.expiresAt && b.expiresInDays !== undefined), {
    message: "give expiresAt or expiresInDays, not both",
    path: ["expiresAt"],
  })
  .refine((b) => !b.expiresAt || Date.parse(b.expiresAt) > Date.now(), {
    message: "expiresAt must be in the future",
    path: ["expiresAt"],
  })
  .refine((b) => !b.expiresAt || Date.parse(b.expiresAt) <= Date.now() + LINK_MAX_DAYS * 86_400_000, {
    message: `expiresAt must be within ${LINK_MAX_DAYS} days`,
    path: ["expiresAt"],
  });

// The answers (members, invitations, run links, comments, sign-offs) are declared once, as zod
// schemas in ./responses; their types are re-exported here under the names the UI uses.
export type { CommentJson, InvitationJson, InvitationPreviewJson, MemberJson, SignoffJson } from "./responses";

export const DECISION_LABEL: Record<DecisionName, string> = {
  approved: "Approved",
  changes_requested: "Changes requested",
};

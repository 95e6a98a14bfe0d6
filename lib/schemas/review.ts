// Request bodies and answers of the review side: deliberate sign-offs, review requests, the
// review queue and labelled run links. Shared by the route handlers and the client.
import { z } from "zod";
import { DECISIONS, type Decision } from "./roles";
import { NOTE_MAX, type SignoffJson } from "./team";

export const REVIEW_NOTE_MAX = NOTE_MAX;
export const LINK_LABEL_MAX = 120;
export const REVIEWERS_MAX = 10;

// Plain text: CR/LF normalised, control characters other than newline and tab dropped.
const clean = (s: string) =>
  s
    .replace(/\r\n?/g, "\n")
    .replace(/[\u0000-\u0008\u000b-\u001f\u007f]/g, "")
    .trim();

const noteText = z
  .string({ error: "note must be text" })
  .transform(clean)
  .pipe(z.string().max(REVIEW_NOTE_MAX, { message: `note must be at most ${REVIEW_NOTE_MAX} characters` }));

/**
 * A sign-off is a deliberate choice: `decision` has no default, and "changes requested" needs a
 * note that says what must change (issue path ["note"]).
 */
export const signoffDecisionSchema = z
  .object({
    // "changes-requested" is read as "changes_requested" (both spellings circulate in clients).
    decision: z.preprocess(
      (d) => (d === "changes-requested" ? "changes_requested" : d),
      z.enum(DECISIONS, { error: 'decision is required: "approved" or "changes_requested"' }),
    ),
    note: noteText.default(""),
  })
  .superRefine((b, ctx) => {
    if (b.decision === "changes_requested" && b.note.length === 0) {
      ctx.addIssue({
        code: "custom",
        path: ["note"],
        message: "note is required when requesting changes: say what must change",
      });
    }
  });

export const reviewRequestCreateSchema = z.object({
  reviewerIds: z
    .array(
      z.string({ error: "reviewerIds must be member ids" }).min(1, { message: "reviewerIds must be member ids" }),
      {
        error: "reviewerIds must be a list of member ids",
      },
    )
    .min(1, { message: "reviewerIds must name at least one reviewer" })
    .max(REVIEWERS_MAX, { message: `reviewerIds may name at most ${REVIEWERS_MAX} reviewers` }),
  note: noteText.default(""),
});

export const linkLabelSchema = z.object({
  label: z
    .string({ error: "label must be text" })
    .transform(clean)
    .pipe(z.string().max(LINK_LABEL_MAX, { message: `label must be at most ${LINK_LABEL_MAX} characters` }))
    .optional(),
});

export type SignoffDecision = z.infer<typeof signoffDecisionSchema>;
export type ReviewRequestCreate = z.infer<typeof reviewRequestCreateSchema>;

// ---- Answers ----
export interface PersonRef {
  id: string | null;
  name: string;
}

/** A sign-off with the scenario version it applies to; withdrawn ones carry `withdrawnAt`. */
export interface SignoffRecord extends SignoffJson {
  scenarioVersion: number | null;
  withdrawnAt: string | null;
}

/** GET /api/runs/:id/signoffs: `items` are the standing decisions (newest first; the first is the run's state). */
export interface SignoffList {
  items: SignoffRecord[];
  withdrawn: SignoffRecord[];
}

export interface ReviewRequestJson {
  id: string;
  runId: string;
  reviewer: PersonRef;
  requestedBy: PersonRef;
  note: string;
  createdAt: string;
  /** The reviewer's standing decision on the run, if any. */
  decision: Decision | null;
  decidedAt: string | null;
}

export interface QueueRunRef {
  id: string;
  label: string;
  createdAt: string;
  scenarioVersion: number | null;
  scenario: { id: string; name: string; version: number; boardId: string; boardName: string };
}

export interface QueueItem {
  run: QueueRunRef;
  requests: ReviewRequestJson[];
  /** The run's standing decision (latest non-withdrawn sign-off), if any. */
  decision: SignoffRecord | null;
  /** The decision applies to an older scenario version than the scenario's current one. */
  outOfDate: boolean;
}

/** GET /api/review/queue */
export interface ReviewQueue {
  waitingOnMe: QueueItem[];
  requestedByMe: QueueItem[];
  decided: QueueItem[];
}

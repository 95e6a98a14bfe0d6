// Request bodies of the review side: deliberate sign-offs, review requests and labelled run
// links. Shared by the route handlers and the client.
import { z } from "zod";
import { DECISIONS } from "./roles";
import { NOTE_MAX } from "./team";

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

// The answers are declared once, as zod schemas in ./responses; re-exported here under the
// names the UI uses.
export type {
  QueueItemJson as QueueItem,
  ReviewQueueJson as ReviewQueue,
  ReviewRequestJson,
  SignoffJson as SignoffRecord,
  SignoffListJson as SignoffList,
} from "./responses";

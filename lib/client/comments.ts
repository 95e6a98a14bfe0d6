// Comments on a run: GET /api/runs/:id/comments.
import useSWR from "swr";
import type { CommentJson, ListOf } from "@/lib/schemas/responses";
import { enc, get } from "./swr";

export const commentsKey = (runId: string) => `/api/runs/${enc(runId)}/comments`;

export const useComments = (runId: string | null) =>
  useSWR<ListOf<CommentJson>>(runId ? commentsKey(runId) : null, get);

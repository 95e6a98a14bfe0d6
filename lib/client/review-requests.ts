// Review requests of a run (GET /api/runs/:id/review-requests) and a member's review queue
// (GET /api/review/queue[?boardId=]).
import useSWR from "swr";
import type { ListOf, ReviewQueueJson, ReviewRequestJson } from "@/lib/schemas/responses";
import { enc, get } from "./swr";

export const reviewRequestsKey = (runId: string) => `/api/runs/${enc(runId)}/review-requests`;
export const reviewQueueKey = (boardId?: string | null) =>
  boardId ? `/api/review/queue?boardId=${enc(boardId)}` : "/api/review/queue";

export const useReviewRequests = (runId: string | null) =>
  useSWR<ListOf<ReviewRequestJson>>(runId ? reviewRequestsKey(runId) : null, get);
export const useReviewQueue = (boardId?: string | null) => useSWR<ReviewQueueJson>(reviewQueueKey(boardId), get);

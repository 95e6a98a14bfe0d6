// SWR hooks of the review side (keys are the API URLs; the fetcher throws on non-2xx).
import useSWR from "swr";
import { fetchJson } from "./fetcher";
import type { ReviewQueue, ReviewRequestJson, SignoffList } from "@/lib/schemas/review";
import { signoffsKey } from "./team-hooks";

const get = <T>(url: string) => fetchJson<T>(url);

export const reviewRequestsKey = (runId: string) => `/api/runs/${encodeURIComponent(runId)}/review-requests`;
export const reviewQueueKey = (boardId?: string | null) =>
  boardId ? `/api/review/queue?boardId=${encodeURIComponent(boardId)}` : "/api/review/queue";
export const signoffKey = (runId: string, signoffId: string) =>
  `${signoffsKey(runId)}/${encodeURIComponent(signoffId)}`;

export { signoffsKey };
export const useSignoffList = (runId: string | null) => useSWR<SignoffList>(runId ? signoffsKey(runId) : null, get);
export const useReviewRequests = (runId: string | null) =>
  useSWR<{ items: ReviewRequestJson[] }>(runId ? reviewRequestsKey(runId) : null, get);
export const useReviewQueue = (boardId?: string | null) => useSWR<ReviewQueue>(reviewQueueKey(boardId), get);

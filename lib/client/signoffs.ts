// Sign-offs of a run: GET /api/runs/:id/signoffs (standing `items`, newest first, and `withdrawn`).
import useSWR from "swr";
import type { SignoffListJson } from "@/lib/schemas/responses";
import { enc, get } from "./swr";

export const signoffsKey = (runId: string) => `/api/runs/${enc(runId)}/signoffs`;
export const signoffKey = (runId: string, signoffId: string) => `${signoffsKey(runId)}/${enc(signoffId)}`;

export const useSignoffs = (runId: string | null) => useSWR<SignoffListJson>(runId ? signoffsKey(runId) : null, get);
/** The same hook under the name the review panels use. */
export const useSignoffList = useSignoffs;

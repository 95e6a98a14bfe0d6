// Uploaded captures: GET /api/captures (summaries) and /api/captures/:id (with samples).
import useSWR from "swr";
import type { CaptureJson, CaptureSummaryJson, ListOf } from "@/lib/schemas/responses";
import { enc, get, quiet } from "./swr";

export type CaptureSummary = CaptureSummaryJson;
export type CaptureRecord = CaptureJson;

export const capturesKey = "/api/captures";
export const captureKey = (id: string) => `/api/captures/${enc(id)}`;

export const useCaptures = () => useSWR<ListOf<CaptureSummaryJson>>(capturesKey, get, quiet);
export const useCapture = (id: string | null) => useSWR<CaptureJson>(id ? captureKey(id) : null, get, quiet);

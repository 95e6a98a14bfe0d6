// The team's part profiles: GET /api/parts.
import useSWR from "swr";
import type { ListOf, PartProfileJson } from "@/lib/schemas/responses";
import { get, quiet } from "./swr";

export type PartProfileRecord = PartProfileJson;

export const partsKey = "/api/parts";

export const useParts = () => useSWR<ListOf<PartProfileJson>>(partsKey, get, quiet);

// Team members: GET /api/team/members.
import useSWR from "swr";
import type { ListOf, MemberJson } from "@/lib/schemas/responses";
import { get, quiet } from "./swr";

export const membersKey = "/api/team/members";

export const useMembers = () => useSWR<ListOf<MemberJson>>(membersKey, get, quiet);

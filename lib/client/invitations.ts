// Pending invitations of the team: GET /api/team/invitations (owner).
import useSWR from "swr";
import type { InvitationJson, ListOf } from "@/lib/schemas/responses";
import { get, quiet } from "./swr";

export const invitationsKey = "/api/team/invitations";

export const useInvitations = (enabled = true) =>
  useSWR<ListOf<InvitationJson>>(enabled ? invitationsKey : null, get, quiet);

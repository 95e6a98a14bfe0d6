// Team roles and sign-off decisions (DEVELOPERS.md § Roles), shared by models, session and UI.
import { z } from "zod";

export const ROLES = ["owner", "designer", "reviewer", "viewer"] as const;
export type Role = (typeof ROLES)[number];
export const roleSchema = z.enum(ROLES, { error: `role must be one of ${ROLES.join(", ")}` });

export const DECISIONS = ["approved", "changes_requested"] as const;
export type Decision = (typeof DECISIONS)[number];
export const decisionSchema = z.enum(DECISIONS, { error: `decision must be one of ${DECISIONS.join(", ")}` });

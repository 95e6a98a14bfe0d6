// Demo teams and accounts (invented). Seeded by `npm run db:setup`; the sign-in page lists
// them outside production. Never use these in a real deployment.
import type { Role } from "@/lib/schemas/roles";

export const DEMO_PASSWORD = "railwise-demo";

export const DEMO_TEAMS = {
  fjordline: "Fjordline Aquaculture",
  harrow: "Harrow Marine",
} as const;

export interface DemoAccount {
  email: string;
  name: string;
  role: Role;
  team: string;
}

export const DEMO_ACCOUNTS: DemoAccount[] = [
  { email: "owner@fjordline.example", name: "Sigrid Holm", role: "owner", team: DEMO_TEAMS.fjordline },
  { email: "designer@fjordline.example", name: "Tomas Berge", role: "designer", team: DEMO_TEAMS.fjordline },
  { email: "reviewer@fjordline.example", name: "Maren Lie", role: "reviewer", team: DEMO_TEAMS.fjordline },
  { email: "viewer@fjordline.example", name: "Jonas Dahl", role: "viewer", team: DEMO_TEAMS.fjordline },
  { email: "owner@harrowmarine.example", name: "Helen Marsh", role: "owner", team: DEMO_TEAMS.harrow },
];

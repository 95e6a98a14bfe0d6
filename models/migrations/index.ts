// The ordered list of migrations. Listed explicitly (not globbed) so the same list runs
// under tsx, vitest and the Next server without a TypeScript loader for dynamic requires.
import type { QueryInterface } from "sequelize";
import * as m0001 from "./0001-initial";
import * as m0003 from "./0003-sessions-and-limits";
import * as m0002 from "./0002-text-columns";
import * as m0004 from "./0004-review";
import * as m0005 from "./0005-scenario-summary";

export interface Migration {
  name: string;
  up(params: { context: QueryInterface }): Promise<void>;
  down(params: { context: QueryInterface }): Promise<void>;
}

export const MIGRATIONS: Migration[] = [
  { name: "0001-initial", ...m0001 },
  { name: "0002-text-columns", ...m0002 },
  { name: "0003-sessions-and-limits", ...m0003 },
  { name: "0004-review", ...m0004 },
  { name: "0005-scenario-summary", ...m0005 },
];

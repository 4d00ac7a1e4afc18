// Migrations in order. Listed explicitly (not globbed) so they work from tsx, vitest and Next alike.
import * as m0001 from "./0001-initial";
import * as m0002 from "./0002-analysis";

export const MIGRATIONS = [
  { name: "0001-initial", ...m0001 },
  { name: "0002-analysis", ...m0002 },
];

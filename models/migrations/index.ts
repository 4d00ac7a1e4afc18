// Migrations in order. Listed explicitly (not globbed) so they work from tsx, vitest and Next alike.
import * as m0001 from "./0001-initial";
import * as m0002 from "./0002-analysis";
import * as m0003 from "./0003-invites";
import * as m0004 from "./0004-reviews";
import * as m0005 from "./0005-outbox";
import * as m0006 from "./0006-map-positions";
import * as m0007 from "./0007-single-point";
import * as m0008 from "./0008-need-kinds";
import * as m0009 from "./0009-change-policies";
import * as m0010 from "./0010-traces";
import * as m0011 from "./0011-sessions-and-workers";
import * as m0012 from "./0012-incidents";
import * as m0013 from "./0013-analysis-results";
import * as m0014 from "./0014-job-queue";
import * as m0015 from "./0015-map-layouts";

export const MIGRATIONS = [
  { name: "0001-initial", ...m0001 },
  { name: "0002-analysis", ...m0002 },
  { name: "0003-invites", ...m0003 },
  { name: "0004-reviews", ...m0004 },
  { name: "0005-outbox", ...m0005 },
  { name: "0006-map-positions", ...m0006 },
  { name: "0007-single-point", ...m0007 },
  { name: "0008-need-kinds", ...m0008 },
  { name: "0009-change-policies", ...m0009 },
  { name: "0010-traces", ...m0010 },
  { name: "0011-sessions-and-workers", ...m0011 },
  { name: "0012-incidents", ...m0012 },
  { name: "0013-analysis-results", ...m0013 },
  { name: "0014-job-queue", ...m0014 },
  { name: "0015-map-layouts", ...m0015 },
];

// npm run db:seed — the Harbor Pantry demo (demo mode only), then analysis of what it pushed.
import path from "node:path";
import { closeDb } from "../models";
import { migrateToLatest } from "../models/migrate";
import { db } from "../models";
import { drainAnalysisQueue } from "../lib/jobs/analysis";
import { drainMapLayoutQueue } from "../lib/jobs/map-layout";
import { seedDemo } from "../lib/data/seed";
import { closeParsePool } from "../importers/off-thread";

async function main() {
  if (process.env.PINCHPOINT_DEMO !== "1") {
    console.log("[seed] not in demo mode (PINCHPOINT_DEMO=1): no demo data, no default password");
    return;
  }
  await migrateToLatest(db().sequelize);
  let ran = 0;
  await seedDemo({ examplesDir: path.resolve(__dirname, "../examples/harbor-pantry"), afterPush: async () => (ran += await drainAnalysisQueue()) });
  if (ran) console.log(`[seed] analysed ${ran} snapshot(s)`);
  // The demo map opens on stored layouts at once, without waiting for the worker.
  const laid = await drainMapLayoutQueue();
  if (laid) console.log(`[seed] laid out the map of ${laid} snapshot(s)`);
}

main()
  .then(() => Promise.all([closeDb(), closeParsePool()]))
  .catch(async (error: unknown) => {
    console.error("[seed] failed:", error);
    await closeDb();
    process.exit(1);
  });

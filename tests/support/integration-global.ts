// Once per integration run: build the migrated template database every test file copies.
import { closeDb, db } from "@/models";
import { migrateToLatest } from "@/models/migrate";
import { TEMPLATE_DB, dropDatabase, urlFor, withAdmin } from "./test-db";

function processAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch {
    return false;
  }
}

async function dropTemplateWhenFree(): Promise<void> {
  for (let attempt = 0; attempt < 50; attempt++) {
    try {
      await withAdmin((c) => c.query(`DROP DATABASE IF EXISTS "${TEMPLATE_DB}"`));
      return;
    } catch {
      await new Promise((r) => setTimeout(r, 200));
    }
  }
  await dropDatabase(TEMPLATE_DB);
}

export default async function setup() {
  // Leftovers of an interrupted run: per-file databases whose test process is gone.
  const stale = await withAdmin((c) => c.query<{ datname: string }>("SELECT datname FROM pg_database WHERE datname LIKE 'pp_test_%'"));
  for (const row of stale.rows) {
    const pid = Number(/^pp_test_(\d+)_/.exec(row.datname)?.[1]);
    if (pid && processAlive(pid)) continue;
    if (row.datname !== TEMPLATE_DB) await dropDatabase(row.datname);
  }
  // The template is rebuilt every run (a run elsewhere may be copying it: wait rather than break it).
  await dropTemplateWhenFree();
  await withAdmin((c) => c.query(`CREATE DATABASE "${TEMPLATE_DB}"`));
  process.env.DATABASE_URL = urlFor(TEMPLATE_DB);
  await migrateToLatest(db().sequelize);
  await closeDb();
}

// Once per integration run: build the migrated template database every test file copies.
import { closeDb, db } from "@/models";
import { migrateToLatest } from "@/models/migrate";
import { TEMPLATE_DB, dropDatabase, urlFor, withAdmin } from "./test-db";

export default async function setup() {
  // Leftovers of an interrupted run.
  const stale = await withAdmin((c) => c.query<{ datname: string }>("SELECT datname FROM pg_database WHERE datname LIKE 'pp_test_%'"));
  for (const row of stale.rows) await dropDatabase(row.datname);
  await withAdmin((c) => c.query(`CREATE DATABASE "${TEMPLATE_DB}"`));
  process.env.DATABASE_URL = urlFor(TEMPLATE_DB);
  await migrateToLatest(db().sequelize);
  await closeDb();
}

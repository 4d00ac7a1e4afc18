// npm run db:migrate — apply pending migrations to DATABASE_URL.
import { closeDb, db } from "../models";
import { migrateToLatest } from "../models/migrate";

async function main() {
  const applied = await migrateToLatest(db().sequelize);
  console.log(applied.length ? `[migrate] applied ${applied.join(", ")}` : "[migrate] schema is up to date");
  await closeDb();
}

main().catch((error: unknown) => {
  console.error("[migrate] failed:", error);
  process.exit(1);
});

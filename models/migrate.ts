import { SequelizeStorage, Umzug, type MigrationParams } from "umzug";
import type { Sequelize } from "sequelize";
import { MIGRATIONS } from "./migrations";

function migrator(sequelize: Sequelize) {
  return new Umzug({
    migrations: MIGRATIONS.map(({ name, up, down }) => ({
      name,
      up: (params: MigrationParams<Sequelize>) => up({ name, context: params.context }),
      down: (params: MigrationParams<Sequelize>) => down({ name, context: params.context }),
    })),
    context: sequelize,
    storage: new SequelizeStorage({ sequelize, tableName: "schema_migrations" }),
    logger: undefined,
  });
}

/** Apply every pending migration inside an advisory lock, so two starting instances do not race. */
export async function migrateToLatest(sequelize: Sequelize): Promise<string[]> {
  // The lock belongs to this transaction's connection and is released when it ends.
  return sequelize.transaction(async (transaction) => {
    await sequelize.query("SELECT pg_advisory_xact_lock(727001)", { transaction });
    const applied = await migrator(sequelize).up();
    return applied.map((m) => m.name);
  });
}

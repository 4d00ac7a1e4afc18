import type { MigrationFn } from "./types";

// Pinned map positions per environment.
export const up: MigrationFn = async ({ context: sequelize }) => {
  await sequelize.query(`
    CREATE TABLE map_positions (
      id uuid PRIMARY KEY,
      environment_id uuid NOT NULL REFERENCES environments(id) ON DELETE CASCADE,
      key varchar(128) NOT NULL,
      x double precision NOT NULL,
      y double precision NOT NULL,
      updated_by uuid REFERENCES users(id) ON DELETE SET NULL,
      UNIQUE (environment_id, key)
    );
  `);
};

export const down: MigrationFn = async ({ context: sequelize }) => {
  await sequelize.query("DROP TABLE IF EXISTS map_positions");
};

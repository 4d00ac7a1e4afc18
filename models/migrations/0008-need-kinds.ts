import type { MigrationFn } from "./types";

// Second round of the inventory model (DESIGN §10): start-up-only needs, the telemetry kind,
// how each need is known (declared / inferred / observed) and where an inferred one was written,
// the name a source wrote when it was an alias, component aliases, and per-environment settings.
export const up: MigrationFn = async ({ context: sequelize }) => {
  await sequelize.query(`
    ALTER TYPE dependency_strength ADD VALUE IF NOT EXISTS 'startup';
    ALTER TYPE component_kind ADD VALUE IF NOT EXISTS 'telemetry' BEFORE 'undeclared';
    ALTER TABLE components ADD COLUMN aliases text[] NOT NULL DEFAULT '{}';
    CREATE INDEX components_aliases ON components USING gin (aliases);
    ALTER TABLE dependencies
      ADD COLUMN provenance text[] NOT NULL DEFAULT '{declared}',
      ADD COLUMN written_to varchar(128),
      ADD COLUMN origin jsonb;
    ALTER TABLE environments ADD COLUMN settings jsonb NOT NULL DEFAULT '{}';
  `);
};

export const down: MigrationFn = async ({ context: sequelize }) => {
  // Enum values cannot be dropped in PostgreSQL; the columns can.
  await sequelize.query(`
    ALTER TABLE environments DROP COLUMN settings;
    ALTER TABLE dependencies DROP COLUMN origin, DROP COLUMN written_to, DROP COLUMN provenance;
    DROP INDEX components_aliases;
    ALTER TABLE components DROP COLUMN aliases;
  `);
};

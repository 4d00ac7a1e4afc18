import type { MigrationFn } from "./types";

// The analysis' own "single point" flag (S of the pinch score), stored with the other measures
// so that every screen shows the same rule instead of recomputing it.
export const up: MigrationFn = async ({ context: sequelize }) => {
  await sequelize.query(`ALTER TABLE component_metrics ADD COLUMN single_point boolean NOT NULL DEFAULT false`);
};

export const down: MigrationFn = async ({ context: sequelize }) => {
  await sequelize.query(`ALTER TABLE component_metrics DROP COLUMN single_point`);
};

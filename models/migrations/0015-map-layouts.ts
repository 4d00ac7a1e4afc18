import type { MigrationFn } from "./types";

// Map layouts computed by the worker after each analysis (lib/data/map-layouts.ts), one row per
// snapshot and view (`teams`, `grouped`, `flat`, `team:<slot>`), and the queue that asks for them.
export const up: MigrationFn = async ({ context: sequelize }) => {
  await sequelize.query(`
    CREATE TABLE map_layouts (
      snapshot_id uuid NOT NULL REFERENCES snapshots(id) ON DELETE CASCADE,
      view varchar(160) NOT NULL,
      layout jsonb NOT NULL,
      computed_ms integer NOT NULL,
      created_at timestamptz NOT NULL DEFAULT now(),
      PRIMARY KEY (snapshot_id, view)
    );
  `);
  await sequelize.query("SELECT pgboss.create_queue('map-layout', CAST(:options AS json))", { replacements: { options: JSON.stringify({ policy: "standard" }) } });
};

export const down: MigrationFn = async ({ context: sequelize }) => {
  await sequelize.query("SELECT pgboss.delete_queue('map-layout')");
  await sequelize.query("DROP TABLE IF EXISTS map_layouts");
};

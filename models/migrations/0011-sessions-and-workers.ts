import type { MigrationFn } from "./types";

// users.session_version: every session cookie carries the version it was issued under, and a
// request is refused once the account's version has moved on (sign-out, password set, role change,
// deactivation), so ending a session does not wait for the cookie to expire.
// worker_heartbeats: each analysis worker says it is alive every few seconds, so the health
// endpoint and the overview can tell when no worker is running.
export const up: MigrationFn = async ({ context: sequelize }) => {
  await sequelize.query(`ALTER TABLE users ADD COLUMN session_version integer NOT NULL DEFAULT 0`);
  await sequelize.query(`
    CREATE TABLE worker_heartbeats (
      worker_id text PRIMARY KEY,
      host text NOT NULL,
      pid integer NOT NULL,
      started_at timestamptz NOT NULL,
      last_seen_at timestamptz NOT NULL,
      job_id uuid NULL
    )`);
  await sequelize.query(`CREATE INDEX worker_heartbeats_last_seen ON worker_heartbeats (last_seen_at DESC)`);
};

export const down: MigrationFn = async ({ context: sequelize }) => {
  await sequelize.query(`DROP TABLE worker_heartbeats`);
  await sequelize.query(`ALTER TABLE users DROP COLUMN session_version`);
};

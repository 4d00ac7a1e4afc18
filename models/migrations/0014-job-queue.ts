import PgBoss from "pg-boss";
import type { MigrationFn } from "./types";

// One queue library for analyses and mail (lib/data/job-queue.ts): pg-boss's own schema, created
// from the construction plan of the pinned pg-boss version (schema version 24, pg-boss 10.4), and
// our queues in it. pg-boss wraps its plan in BEGIN … COMMIT; here it runs inside the migration's
// own transaction instead, so a failed migration leaves neither half. A later pg-boss version with
// another schema version needs its own migration (PgBoss.getMigrationPlans); a worker started
// against the wrong version stops with "pg-boss database requires migrations".
//
// analysis_runs stays the product's record of an analysis; it learns which queue job holds it
// (job_id) and a status for snapshots a newer one replaced before they were analysed. The outbox
// stays the record of each e-mail; when it is due again is the queue's business now.
const QUEUES = { analysis: "short", mail: "standard", "review-reminders": "standard", "risk-digest": "standard" } as const;

function constructionPlan(): string {
  const plan = PgBoss.getConstructionPlans("pgboss").trim();
  if (!plan.startsWith("BEGIN;") || !plan.endsWith("COMMIT;")) throw new Error("unexpected shape of pg-boss's construction plan");
  return plan.slice("BEGIN;".length, -"COMMIT;".length);
}

export const up: MigrationFn = async ({ context: sequelize }) => {
  await sequelize.query(constructionPlan());
  for (const [name, policy] of Object.entries(QUEUES)) {
    await sequelize.query("SELECT pgboss.create_queue(:name, CAST(:options AS json))", { replacements: { name, options: JSON.stringify({ policy }) } });
  }
  await sequelize.query(`
    ALTER TYPE analysis_status ADD VALUE IF NOT EXISTS 'superseded';
    ALTER TABLE analysis_runs ADD COLUMN job_id uuid;
    DROP INDEX IF EXISTS analysis_runs_queue;
    CREATE INDEX analysis_runs_running ON analysis_runs (heartbeat_at) WHERE status = 'running';
    CREATE INDEX analysis_runs_environment ON analysis_runs (environment_id, status);

    DROP INDEX IF EXISTS outbox_messages_due;
    ALTER TABLE outbox_messages DROP COLUMN next_attempt_at, ADD COLUMN job_id uuid;
    CREATE INDEX outbox_messages_unsent ON outbox_messages (created_at) WHERE status <> 'sent';
  `);
};

export const down: MigrationFn = async ({ context: sequelize }) => {
  await sequelize.query(`
    DROP INDEX IF EXISTS outbox_messages_unsent;
    ALTER TABLE outbox_messages DROP COLUMN job_id, ADD COLUMN next_attempt_at timestamptz NOT NULL DEFAULT now();
    CREATE INDEX outbox_messages_due ON outbox_messages (next_attempt_at) WHERE status = 'queued';
    DROP INDEX IF EXISTS analysis_runs_environment;
    DROP INDEX IF EXISTS analysis_runs_running;
    CREATE INDEX analysis_runs_queue ON analysis_runs (status, created_at);
    ALTER TABLE analysis_runs DROP COLUMN job_id;
    DROP SCHEMA IF EXISTS pgboss CASCADE;
  `);
  // PostgreSQL cannot drop one value of an enum; 'superseded' stays, unused.
};

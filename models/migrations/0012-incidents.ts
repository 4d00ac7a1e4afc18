import type { MigrationFn } from "./types";

// Live incidents (lib/data/incidents.ts): alerts received on an environment's webhook, kept with
// their lifetime, and the incidents they make up — from the first alert to the last one resolved —
// with the probable-origin ranking of the snapshot they were read against.
//   - incidents: at most one open (resolved_at NULL) per environment, numbered per environment.
//     `ranking` is the latest computed while it was open; `peak_ranking` the one computed when the
//     most components fired, which history shows.
//   - alerts: identity is (environment, fingerprint) while firing; a resolved alert keeps its row,
//     and the same fingerprint firing again later is a new row (a new lifetime). Alerts name a
//     component (Pinchpoint format) or carry labels (Alertmanager); which component they mean is
//     worked out when read, under the current inventory and label setting, so an alias added
//     during an incident takes effect at once.
export const up: MigrationFn = async ({ context: sequelize }) => {
  await sequelize.query(`
    CREATE TABLE incidents (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      environment_id uuid NOT NULL REFERENCES environments(id) ON DELETE CASCADE,
      number integer NOT NULL,
      opened_at timestamptz NOT NULL,
      resolved_at timestamptz,
      resolved_by varchar(200),
      peak_firing integer NOT NULL DEFAULT 0,
      ranking jsonb,
      peak_ranking jsonb,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now(),
      UNIQUE (environment_id, number)
    );
    CREATE UNIQUE INDEX incidents_one_open ON incidents (environment_id) WHERE resolved_at IS NULL;

    CREATE TABLE alerts (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      environment_id uuid NOT NULL REFERENCES environments(id) ON DELETE CASCADE,
      incident_id uuid NOT NULL REFERENCES incidents(id) ON DELETE CASCADE,
      fingerprint varchar(300) NOT NULL,
      format varchar(20) NOT NULL CHECK (format IN ('pinchpoint', 'alertmanager')),
      name varchar(300),
      component varchar(200),
      labels jsonb NOT NULL DEFAULT '{}',
      severity varchar(40),
      summary text,
      link text,
      starts_at timestamptz NOT NULL,
      ends_at timestamptz,
      first_received_at timestamptz NOT NULL DEFAULT now(),
      last_received_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE UNIQUE INDEX alerts_one_firing ON alerts (environment_id, fingerprint) WHERE ends_at IS NULL;
    CREATE INDEX alerts_incident ON alerts (incident_id);
    CREATE INDEX alerts_fingerprint ON alerts (environment_id, fingerprint, starts_at);
  `);
};

export const down: MigrationFn = async ({ context: sequelize }) => {
  await sequelize.query("DROP TABLE IF EXISTS alerts; DROP TABLE IF EXISTS incidents;");
};

import type { MigrationFn } from "./types";

// Analysis jobs (a queue in PostgreSQL shared by every app instance) and their stored results.
export const up: MigrationFn = async ({ context: sequelize }) => {
  await sequelize.query(`
    CREATE TYPE analysis_status AS ENUM ('queued', 'running', 'done', 'failed');
    CREATE TABLE analysis_runs (
      id uuid PRIMARY KEY,
      environment_id uuid NOT NULL REFERENCES environments(id) ON DELETE CASCADE,
      snapshot_id uuid NOT NULL UNIQUE REFERENCES snapshots(id) ON DELETE CASCADE,
      status analysis_status NOT NULL,
      progress real NOT NULL DEFAULT 0,
      phase varchar(60),
      attempts integer NOT NULL DEFAULT 0,
      locked_by varchar(100),
      heartbeat_at timestamptz,
      started_at timestamptz,
      finished_at timestamptz,
      error text,
      exact boolean,
      sample_size integer,
      timings jsonb,
      graph jsonb,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX analysis_runs_queue ON analysis_runs (status, created_at);

    CREATE TABLE component_metrics (
      id bigserial PRIMARY KEY,
      snapshot_id uuid NOT NULL REFERENCES snapshots(id) ON DELETE CASCADE,
      key varchar(128) NOT NULL,
      name varchar(200) NOT NULL,
      kind varchar(20) NOT NULL,
      team varchar(63),
      tier smallint NOT NULL,
      betweenness double precision NOT NULL,
      pagerank double precision NOT NULL,
      eigenvector double precision NOT NULL,
      clustering double precision NOT NULL,
      articulation boolean NOT NULL,
      in_cycle boolean NOT NULL,
      blast_down integer NOT NULL,
      blast_degraded integer NOT NULL,
      pinch_score double precision NOT NULL,
      rank integer NOT NULL,
      UNIQUE (snapshot_id, key)
    );
    CREATE INDEX component_metrics_rank ON component_metrics (snapshot_id, rank);
  `);
};

export const down: MigrationFn = async ({ context: sequelize }) => {
  await sequelize.query(`
    DROP TABLE IF EXISTS component_metrics, analysis_runs;
    DROP TYPE IF EXISTS analysis_status;
  `);
};

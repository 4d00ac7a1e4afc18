import type { MigrationFn } from "./types";

// Traces as a source (DESIGN §10): spans are folded into per-edge aggregates on arrival and never
// stored. trace_edges holds one row per (environment, source, caller, callee) in trace names, with
// first and last sighting; trace_edge_buckets its calls, errors and duration histogram per hour, so
// any rolling window adds up from buckets. trace_waiting holds, for a grace period, client spans
// whose server child has not arrived yet and server spans whose parent has not (UNLOGGED: losing it
// in a crash only loses those calls' pairing). trace_state records when the set of observed edges
// last changed and which set the graph last took in.
export const up: MigrationFn = async ({ context: sequelize }) => {
  await sequelize.query(`
    DROP TABLE observed_dependencies;

    CREATE TABLE trace_edges (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      environment_id uuid NOT NULL REFERENCES environments(id) ON DELETE CASCADE,
      source_id uuid NOT NULL REFERENCES sources(id) ON DELETE CASCADE,
      from_name varchar(128) NOT NULL,
      to_name varchar(128) NOT NULL,
      to_kind varchar(20) NOT NULL,
      via varchar(80),
      async boolean NOT NULL DEFAULT false,
      evidence text[] NOT NULL,
      first_seen_at timestamptz NOT NULL,
      last_seen_at timestamptz NOT NULL,
      UNIQUE (environment_id, source_id, from_name, to_name)
    );
    CREATE INDEX trace_edges_seen ON trace_edges (environment_id, last_seen_at);

    CREATE TABLE trace_edge_buckets (
      edge_id uuid NOT NULL REFERENCES trace_edges(id) ON DELETE CASCADE,
      bucket timestamptz NOT NULL,
      calls bigint NOT NULL,
      errors bigint NOT NULL,
      durations jsonb NOT NULL,
      PRIMARY KEY (edge_id, bucket)
    );
    CREATE INDEX trace_edge_buckets_age ON trace_edge_buckets (bucket);

    CREATE UNLOGGED TABLE trace_waiting (
      environment_id uuid NOT NULL REFERENCES environments(id) ON DELETE CASCADE,
      source_id uuid NOT NULL REFERENCES sources(id) ON DELETE CASCADE,
      side char(1) NOT NULL CHECK (side IN ('c', 's')),
      trace_id text NOT NULL,
      span_id text NOT NULL,
      service varchar(128) NOT NULL,
      call jsonb,
      received_at timestamptz NOT NULL DEFAULT now(),
      PRIMARY KEY (environment_id, side, trace_id, span_id)
    );
    CREATE INDEX trace_waiting_age ON trace_waiting (received_at);

    CREATE TABLE trace_state (
      environment_id uuid PRIMARY KEY REFERENCES environments(id) ON DELETE CASCADE,
      edges_changed_at timestamptz NOT NULL DEFAULT now(),
      materialised_hash text,
      materialised_at timestamptz
    );

    -- Sparse duration histograms ({"bucket index": count}, lib/traces/histogram.ts) add bucket by bucket.
    CREATE FUNCTION pinchpoint_histogram_add(a jsonb, b jsonb) RETURNS jsonb LANGUAGE sql IMMUTABLE PARALLEL SAFE AS $$
      SELECT COALESCE(jsonb_object_agg(k, n), '{}'::jsonb)
        FROM (SELECT k, sum(v::bigint) AS n
                FROM (SELECT * FROM jsonb_each_text(COALESCE(a, '{}'::jsonb)) UNION ALL SELECT * FROM jsonb_each_text(COALESCE(b, '{}'::jsonb))) x(k, v)
               GROUP BY k) y
    $$;
    CREATE AGGREGATE pinchpoint_histogram_sum(jsonb) (SFUNC = pinchpoint_histogram_add, STYPE = jsonb, INITCOND = '{}');
  `);
};

export const down: MigrationFn = async ({ context: sequelize }) => {
  await sequelize.query(`
    DROP AGGREGATE pinchpoint_histogram_sum(jsonb);
    DROP FUNCTION pinchpoint_histogram_add(jsonb, jsonb);
    DROP TABLE trace_state, trace_waiting, trace_edge_buckets, trace_edges;
    CREATE TABLE observed_dependencies (
      id uuid PRIMARY KEY,
      environment_id uuid NOT NULL REFERENCES environments(id) ON DELETE CASCADE,
      source_id uuid NOT NULL REFERENCES sources(id) ON DELETE CASCADE,
      from_key varchar(128) NOT NULL,
      to_key varchar(128) NOT NULL,
      count integer NOT NULL,
      evidence varchar(40) NOT NULL,
      last_seen_at timestamptz NOT NULL
    );
    CREATE INDEX observed_env ON observed_dependencies (environment_id, from_key, to_key);
  `);
};

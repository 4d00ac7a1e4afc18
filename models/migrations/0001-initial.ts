import type { MigrationFn } from "./types";

// The first schema: identities, environments, the declared graph, snapshots, tokens, audit.
export const up: MigrationFn = async ({ context: sequelize }) => {
  await sequelize.query(`
    CREATE TYPE user_role AS ENUM ('admin', 'architect', 'lead', 'engineer', 'viewer');
    CREATE TYPE component_kind AS ENUM ('service', 'datastore', 'queue', 'cache', 'gateway', 'network',
      'platform', 'external', 'job', 'undeclared');
    CREATE TYPE dependency_strength AS ENUM ('hard', 'soft');
    CREATE TYPE token_scope AS ENUM ('inventory:write', 'read');

    CREATE TABLE users (
      id uuid PRIMARY KEY,
      email varchar(320) NOT NULL UNIQUE CHECK (email = lower(email)),
      name varchar(200) NOT NULL,
      password_hash varchar(100),
      role user_role NOT NULL,
      active boolean NOT NULL DEFAULT true,
      oidc_subject varchar(255) UNIQUE,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );

    CREATE TABLE teams (
      id uuid PRIMARY KEY,
      slug varchar(63) NOT NULL UNIQUE CHECK (slug ~ '^[a-z0-9][a-z0-9-]{0,62}$'),
      name varchar(200) NOT NULL,
      email varchar(320),
      oncall varchar(200),
      description text,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );

    CREATE TABLE memberships (
      id uuid PRIMARY KEY,
      user_id uuid NOT NULL REFERENCES users(id) ON DELETE CASCADE,
      team_id uuid NOT NULL REFERENCES teams(id) ON DELETE CASCADE,
      is_lead boolean NOT NULL DEFAULT false,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now(),
      UNIQUE (user_id, team_id)
    );

    CREATE TABLE environments (
      id uuid PRIMARY KEY,
      slug varchar(63) NOT NULL UNIQUE CHECK (slug ~ '^[a-z0-9][a-z0-9-]{0,62}$'),
      name varchar(200) NOT NULL,
      pinch_weights jsonb,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );

    CREATE TABLE sources (
      id uuid PRIMARY KEY,
      environment_id uuid NOT NULL REFERENCES environments(id) ON DELETE CASCADE,
      name varchar(128) NOT NULL,
      last_format varchar(20),
      last_push_at timestamptz,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now(),
      UNIQUE (environment_id, name)
    );

    CREATE TABLE components (
      id uuid PRIMARY KEY,
      environment_id uuid NOT NULL REFERENCES environments(id) ON DELETE CASCADE,
      key varchar(128) NOT NULL,
      name varchar(200) NOT NULL,
      kind component_kind NOT NULL,
      team varchar(63),
      tier smallint NOT NULL CHECK (tier BETWEEN 1 AND 4),
      replicas integer NOT NULL CHECK (replicas >= 0),
      zones text[] NOT NULL,
      tags text[] NOT NULL,
      links jsonb NOT NULL,
      source_id uuid REFERENCES sources(id) ON DELETE CASCADE,
      UNIQUE (environment_id, key),
      CHECK ((kind = 'undeclared') = (source_id IS NULL))
    );
    CREATE INDEX components_env_team ON components (environment_id, team);
    CREATE INDEX components_source ON components (source_id);

    CREATE TABLE dependencies (
      id uuid PRIMARY KEY,
      environment_id uuid NOT NULL REFERENCES environments(id) ON DELETE CASCADE,
      from_key varchar(128) NOT NULL,
      to_key varchar(128) NOT NULL,
      strength dependency_strength NOT NULL,
      group_id varchar(600),
      via varchar(100),
      source_id uuid NOT NULL REFERENCES sources(id) ON DELETE CASCADE,
      CHECK (from_key <> to_key)
    );
    CREATE INDEX dependencies_env_from ON dependencies (environment_id, from_key);
    CREATE INDEX dependencies_env_to ON dependencies (environment_id, to_key);
    CREATE INDEX dependencies_source ON dependencies (source_id);

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

    CREATE TABLE component_annotations (
      id uuid PRIMARY KEY,
      environment_id uuid NOT NULL REFERENCES environments(id) ON DELETE CASCADE,
      key varchar(128) NOT NULL,
      owner_team varchar(63),
      notes text,
      updated_by uuid REFERENCES users(id) ON DELETE SET NULL,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now(),
      UNIQUE (environment_id, key)
    );

    CREATE TABLE snapshots (
      id uuid PRIMARY KEY,
      environment_id uuid NOT NULL REFERENCES environments(id) ON DELETE CASCADE,
      number integer NOT NULL,
      hash varchar(64) NOT NULL,
      content jsonb NOT NULL,
      component_count integer NOT NULL,
      dependency_count integer NOT NULL,
      undeclared_count integer NOT NULL,
      source_name varchar(128),
      format varchar(20),
      actor_label varchar(320),
      created_at timestamptz NOT NULL DEFAULT now(),
      UNIQUE (environment_id, number)
    );

    CREATE TABLE import_records (
      id uuid PRIMARY KEY,
      environment_id uuid NOT NULL REFERENCES environments(id) ON DELETE CASCADE,
      source_name varchar(128) NOT NULL,
      format varchar(20) NOT NULL,
      actor_label varchar(320) NOT NULL,
      graph_changed boolean NOT NULL,
      snapshot_number integer,
      summary jsonb NOT NULL,
      warnings jsonb NOT NULL,
      created_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX import_records_env ON import_records (environment_id, created_at DESC);

    CREATE TABLE api_tokens (
      id uuid PRIMARY KEY,
      name varchar(100) NOT NULL,
      prefix varchar(16) NOT NULL,
      secret_hash varchar(64) NOT NULL UNIQUE,
      scopes token_scope[] NOT NULL CHECK (cardinality(scopes) > 0),
      environment_id uuid REFERENCES environments(id) ON DELETE CASCADE,
      source_name varchar(128),
      created_by uuid REFERENCES users(id) ON DELETE SET NULL,
      last_used_at timestamptz,
      revoked_at timestamptz,
      created_at timestamptz NOT NULL DEFAULT now()
    );

    CREATE TABLE audit_events (
      id uuid PRIMARY KEY,
      actor_type varchar(10) NOT NULL,
      actor_id varchar(64),
      actor_label varchar(320) NOT NULL,
      action varchar(64) NOT NULL,
      target_type varchar(40) NOT NULL,
      target_id varchar(200) NOT NULL,
      environment_id uuid REFERENCES environments(id) ON DELETE SET NULL,
      before jsonb,
      after jsonb,
      created_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX audit_events_created ON audit_events (created_at DESC);
    CREATE INDEX audit_events_action ON audit_events (action, created_at DESC);

    CREATE TABLE sign_in_attempts (
      id bigserial PRIMARY KEY,
      bucket varchar(400) NOT NULL,
      created_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX sign_in_attempts_bucket ON sign_in_attempts (bucket, created_at);
  `);
};

export const down: MigrationFn = async ({ context: sequelize }) => {
  await sequelize.query(`
    DROP TABLE IF EXISTS sign_in_attempts, audit_events, api_tokens, import_records, snapshots,
      component_annotations, observed_dependencies, dependencies, components, sources, environments,
      memberships, teams, users CASCADE;
    DROP TYPE IF EXISTS token_scope, dependency_strength, component_kind, user_role;
  `);
};

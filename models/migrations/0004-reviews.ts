import type { MigrationFn } from "./types";

// Risk reviews: one current decision per pinch point; earlier ones are kept in audit_events.
export const up: MigrationFn = async ({ context: sequelize }) => {
  await sequelize.query(`
    CREATE TYPE review_status AS ENUM ('accepted', 'mitigating', 'resolved');
    CREATE TABLE risk_reviews (
      id uuid PRIMARY KEY,
      environment_id uuid NOT NULL REFERENCES environments(id) ON DELETE CASCADE,
      key varchar(128) NOT NULL,
      status review_status NOT NULL,
      rationale text NOT NULL CHECK (length(btrim(rationale)) > 0),
      review_by date,
      reviewer_id uuid REFERENCES users(id) ON DELETE SET NULL,
      notified_at timestamptz,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now(),
      UNIQUE (environment_id, key),
      CHECK (status = 'resolved' OR review_by IS NOT NULL)
    );
    -- the overdue list and the reminder job look for dates that have come
    CREATE INDEX risk_reviews_due ON risk_reviews (review_by) WHERE status <> 'resolved';
    CREATE INDEX audit_events_target ON audit_events (target_type, target_id, created_at DESC);
  `);
};

export const down: MigrationFn = async ({ context: sequelize }) => {
  await sequelize.query(`
    DROP INDEX IF EXISTS audit_events_target;
    DROP TABLE IF EXISTS risk_reviews;
    DROP TYPE IF EXISTS review_status;
  `);
};

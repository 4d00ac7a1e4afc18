import type { MigrationFn } from "./types";

// The mail outbox: messages are rows written in the same transaction as the change they announce,
// so a rolled-back change sends nothing; a worker delivers them afterwards (lib/mail/outbox.ts).
export const up: MigrationFn = async ({ context: sequelize }) => {
  await sequelize.query(`
    CREATE TYPE outbox_status AS ENUM ('queued', 'sent', 'failed');
    CREATE TABLE outbox_messages (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      "to" text[] NOT NULL CHECK (cardinality("to") > 0),
      subject varchar(300) NOT NULL,
      text text NOT NULL,
      html text NOT NULL,
      template varchar(40) NOT NULL,
      status outbox_status NOT NULL DEFAULT 'queued',
      attempts integer NOT NULL DEFAULT 0,
      next_attempt_at timestamptz NOT NULL DEFAULT now(),
      last_error text,
      -- Set by notices that must not repeat (the same top-ten entry announced twice when an
      -- analysis is retried); NULL for messages that may legitimately repeat.
      dedupe_key varchar(300) UNIQUE,
      created_at timestamptz NOT NULL DEFAULT now(),
      sent_at timestamptz
    );
    CREATE INDEX outbox_messages_due ON outbox_messages (next_attempt_at) WHERE status = 'queued';
  `);
};

export const down: MigrationFn = async ({ context: sequelize }) => {
  await sequelize.query(`
    DROP TABLE IF EXISTS outbox_messages;
    DROP TYPE IF EXISTS outbox_status;
  `);
};

import type { MigrationFn } from "./types";

// One-time invite links: an admin invites an e-mail address, the invitee sets a password once.
export const up: MigrationFn = async ({ context: sequelize }) => {
  await sequelize.query(`
    CREATE TABLE invites (
      id uuid PRIMARY KEY,
      user_id uuid NOT NULL REFERENCES users(id) ON DELETE CASCADE,
      secret_hash varchar(64) NOT NULL UNIQUE,
      expires_at timestamptz NOT NULL,
      used_at timestamptz,
      created_by uuid REFERENCES users(id) ON DELETE SET NULL,
      created_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX invites_user ON invites (user_id, created_at DESC);
  `);
};

export const down: MigrationFn = async ({ context: sequelize }) => {
  await sequelize.query(`DROP TABLE IF EXISTS invites;`);
};

import type { MigrationFn } from "./types";

// Change policies per environment (lib/impact/policies.ts): one document per environment, read
// with defaults filled in, so an environment without a row has the default rules.
export const up: MigrationFn = async ({ context: sequelize }) => {
  await sequelize.query(`
    CREATE TABLE change_policies (
      environment_id uuid PRIMARY KEY REFERENCES environments(id) ON DELETE CASCADE,
      policies jsonb NOT NULL,
      updated_by uuid REFERENCES users(id) ON DELETE SET NULL,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );
  `);
};

export const down: MigrationFn = async ({ context: sequelize }) => {
  await sequelize.query("DROP TABLE IF EXISTS change_policies");
};

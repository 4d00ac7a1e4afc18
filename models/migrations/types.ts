import type { Sequelize } from "sequelize";

export type MigrationFn = (params: { name: string; context: Sequelize }) => Promise<void>;

import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";
import type { PinchWeights } from "../lib/analysis/types";
import type { EnvironmentSettings } from "../lib/inventory/settings";

export class Environment extends Model<InferAttributes<Environment>, InferCreationAttributes<Environment>> {
  declare id: CreationOptional<string>;
  declare slug: string;
  declare name: string;
  /** Pinch-score weights, editable by architects; null means the defaults of DESIGN §3. */
  declare pinchWeights: PinchWeights | null;
  /** Per-environment choices (lib/inventory/settings.ts); `{}` means every default. */
  declare settings: CreationOptional<Partial<EnvironmentSettings>>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): typeof Environment {
    return Environment.init(
      {
        id: { type: DataTypes.UUID, defaultValue: DataTypes.UUIDV4, primaryKey: true },
        slug: { type: DataTypes.STRING(63), allowNull: false, unique: true },
        name: { type: DataTypes.STRING(200), allowNull: false },
        pinchWeights: { type: DataTypes.JSONB, allowNull: true },
        settings: { type: DataTypes.JSONB, allowNull: false, defaultValue: {} },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: "environments", underscored: true },
    );
  }
}

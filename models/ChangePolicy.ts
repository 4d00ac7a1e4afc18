import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";

/** An environment's change policies (lib/impact/policies.ts); absent = the defaults. */
export class ChangePolicy extends Model<InferAttributes<ChangePolicy>, InferCreationAttributes<ChangePolicy>> {
  declare environmentId: string;
  /** Validated on every read and write (readPolicies, policySetSchema). */
  declare policies: unknown;
  declare updatedBy: string | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): typeof ChangePolicy {
    return ChangePolicy.init(
      {
        environmentId: { type: DataTypes.UUID, primaryKey: true },
        policies: { type: DataTypes.JSONB, allowNull: false },
        updatedBy: { type: DataTypes.UUID, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: "change_policies", underscored: true },
    );
  }
}

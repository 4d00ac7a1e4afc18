import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";

/** An edge seen in telemetry; kept apart from declared edges so drift can be shown. */
export class ObservedDependency extends Model<InferAttributes<ObservedDependency>, InferCreationAttributes<ObservedDependency>> {
  declare id: CreationOptional<string>;
  declare environmentId: string;
  declare sourceId: string;
  declare fromKey: string;
  declare toKey: string;
  declare count: number;
  declare evidence: string;
  declare lastSeenAt: Date;

  static initModel(sequelize: Sequelize): typeof ObservedDependency {
    return ObservedDependency.init(
      {
        id: { type: DataTypes.UUID, defaultValue: DataTypes.UUIDV4, primaryKey: true },
        environmentId: { type: DataTypes.UUID, allowNull: false },
        sourceId: { type: DataTypes.UUID, allowNull: false },
        fromKey: { type: DataTypes.STRING(128), allowNull: false },
        toKey: { type: DataTypes.STRING(128), allowNull: false },
        count: { type: DataTypes.INTEGER, allowNull: false },
        evidence: { type: DataTypes.STRING(40), allowNull: false },
        lastSeenAt: { type: DataTypes.DATE, allowNull: false },
      },
      { sequelize, tableName: "observed_dependencies", underscored: true, timestamps: false },
    );
  }
}

import { DataTypes, Model, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";

/** An entry point from which a component strictly dominates others: every path from the entry to them passes through it. */
export class ComponentDominance extends Model<InferAttributes<ComponentDominance>, InferCreationAttributes<ComponentDominance>> {
  declare snapshotId: string;
  declare key: string;
  declare entry: string;
  declare dominated: number;

  static initModel(sequelize: Sequelize): typeof ComponentDominance {
    return ComponentDominance.init(
      {
        snapshotId: { type: DataTypes.UUID, allowNull: false, primaryKey: true },
        key: { type: DataTypes.STRING(128), allowNull: false, primaryKey: true },
        entry: { type: DataTypes.STRING(128), allowNull: false, primaryKey: true },
        dominated: { type: DataTypes.INTEGER, allowNull: false },
      },
      { sequelize, tableName: "component_dominance", underscored: true, timestamps: false },
    );
  }
}

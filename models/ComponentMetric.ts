import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";
import type { ComponentKind, Tier } from "../lib/inventory/types";

/** The measures of one component in one snapshot; descriptive columns copied for sorting and filtering. */
export class ComponentMetric extends Model<InferAttributes<ComponentMetric>, InferCreationAttributes<ComponentMetric>> {
  declare id: CreationOptional<number>;
  declare snapshotId: string;
  declare key: string;
  declare name: string;
  declare kind: ComponentKind;
  declare team: string | null;
  declare tier: Tier;
  declare betweenness: number;
  declare pagerank: number;
  declare eigenvector: number;
  declare clustering: number;
  declare articulation: boolean;
  declare inCycle: boolean;
  declare blastDown: number;
  declare blastDegraded: number;
  declare pinchScore: number;
  declare singlePoint: CreationOptional<boolean>;
  declare rank: number;

  static initModel(sequelize: Sequelize): typeof ComponentMetric {
    return ComponentMetric.init(
      {
        id: { type: DataTypes.BIGINT, autoIncrement: true, primaryKey: true },
        snapshotId: { type: DataTypes.UUID, allowNull: false },
        key: { type: DataTypes.STRING(128), allowNull: false },
        name: { type: DataTypes.STRING(200), allowNull: false },
        kind: { type: DataTypes.STRING(20), allowNull: false },
        team: { type: DataTypes.STRING(63), allowNull: true },
        tier: { type: DataTypes.SMALLINT, allowNull: false },
        betweenness: { type: DataTypes.DOUBLE, allowNull: false },
        pagerank: { type: DataTypes.DOUBLE, allowNull: false },
        eigenvector: { type: DataTypes.DOUBLE, allowNull: false },
        clustering: { type: DataTypes.DOUBLE, allowNull: false },
        articulation: { type: DataTypes.BOOLEAN, allowNull: false },
        inCycle: { type: DataTypes.BOOLEAN, allowNull: false },
        blastDown: { type: DataTypes.INTEGER, allowNull: false },
        blastDegraded: { type: DataTypes.INTEGER, allowNull: false },
        pinchScore: { type: DataTypes.DOUBLE, allowNull: false },
        singlePoint: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        rank: { type: DataTypes.INTEGER, allowNull: false },
      },
      { sequelize, tableName: "component_metrics", underscored: true, timestamps: false },
    );
  }
}

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
  /** null when the iteration did not converge */
  declare pagerank: number | null;
  declare eigenvector: number | null;
  declare clustering: number;
  declare articulation: boolean;
  declare inCycle: boolean;
  declare blastDown: number;
  declare blastDegraded: number;
  declare pinchScore: number;
  declare singlePoint: CreationOptional<boolean>;
  /** competition rank by betweenness (ties share), and how many share it; likewise for the other ranked measures */
  declare rank: number;
  declare tied: CreationOptional<number>;
  declare rankPagerank: number | null;
  declare tiedPagerank: CreationOptional<number>;
  declare rankEigenvector: number | null;
  declare tiedEigenvector: CreationOptional<number>;
  declare rankPinch: number | null;
  declare tiedPinch: CreationOptional<number>;
  declare rankBlast: number | null;
  declare tiedBlast: CreationOptional<number>;
  declare bootStage: number | null;
  declare waitsOnCycle: CreationOptional<boolean>;
  /** tier 1 with no dependents: an entry point of the dominator analysis */
  declare entry: CreationOptional<boolean>;
  declare entriesReaching: number | null;
  declare entriesDominated: number | null;
  declare maxDominated: number | null;
  declare dominatedAll: number | null;
  declare idomAll: string | null;

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
        pagerank: { type: DataTypes.DOUBLE, allowNull: true },
        eigenvector: { type: DataTypes.DOUBLE, allowNull: true },
        clustering: { type: DataTypes.DOUBLE, allowNull: false },
        articulation: { type: DataTypes.BOOLEAN, allowNull: false },
        inCycle: { type: DataTypes.BOOLEAN, allowNull: false },
        blastDown: { type: DataTypes.INTEGER, allowNull: false },
        blastDegraded: { type: DataTypes.INTEGER, allowNull: false },
        pinchScore: { type: DataTypes.DOUBLE, allowNull: false },
        singlePoint: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        rank: { type: DataTypes.INTEGER, allowNull: false },
        tied: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
        rankPagerank: { type: DataTypes.INTEGER, allowNull: true },
        tiedPagerank: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
        rankEigenvector: { type: DataTypes.INTEGER, allowNull: true },
        tiedEigenvector: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
        rankPinch: { type: DataTypes.INTEGER, allowNull: true },
        tiedPinch: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
        rankBlast: { type: DataTypes.INTEGER, allowNull: true },
        tiedBlast: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
        bootStage: { type: DataTypes.INTEGER, allowNull: true },
        waitsOnCycle: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        entry: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        entriesReaching: { type: DataTypes.INTEGER, allowNull: true },
        entriesDominated: { type: DataTypes.INTEGER, allowNull: true },
        maxDominated: { type: DataTypes.INTEGER, allowNull: true },
        dominatedAll: { type: DataTypes.INTEGER, allowNull: true },
        idomAll: { type: DataTypes.STRING(128), allowNull: true },
      },
      { sequelize, tableName: "component_metrics", underscored: true, timestamps: false },
    );
  }
}

import { DataTypes, Model, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";

/** A dependency cycle found by an analysis: among runtime needs, or among all needs for a cold start (with how to break it). */
export class AnalysisCycle extends Model<InferAttributes<AnalysisCycle>, InferCreationAttributes<AnalysisCycle>> {
  declare snapshotId: string;
  declare kind: "runtime" | "boot";
  declare position: number;
  declare members: string[];
  declare startOrder: string[] | null;
  declare breaks: Array<{ from: string; to: string; strength: string }> | null;
  declare breakCount: number | null;

  static initModel(sequelize: Sequelize): typeof AnalysisCycle {
    return AnalysisCycle.init(
      {
        snapshotId: { type: DataTypes.UUID, allowNull: false, primaryKey: true },
        kind: { type: DataTypes.STRING(10), allowNull: false, primaryKey: true },
        position: { type: DataTypes.INTEGER, allowNull: false, primaryKey: true },
        members: { type: DataTypes.ARRAY(DataTypes.TEXT), allowNull: false },
        startOrder: { type: DataTypes.ARRAY(DataTypes.TEXT), allowNull: true },
        breaks: { type: DataTypes.JSONB, allowNull: true },
        breakCount: { type: DataTypes.INTEGER, allowNull: true },
      },
      { sequelize, tableName: "analysis_cycles", underscored: true, timestamps: false },
    );
  }
}

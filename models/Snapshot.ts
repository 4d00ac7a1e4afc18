import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";
import type { SnapshotContent } from "../lib/inventory/snapshot";

/** An immutable, numbered version of an environment's whole graph. */
export class Snapshot extends Model<InferAttributes<Snapshot>, InferCreationAttributes<Snapshot>> {
  declare id: CreationOptional<string>;
  declare environmentId: string;
  declare number: number;
  /** sha256 of the canonical content: identical content makes no new snapshot */
  declare hash: string;
  declare content: SnapshotContent;
  declare componentCount: number;
  declare dependencyCount: number;
  declare undeclaredCount: number;
  /** the push that made it */
  declare sourceName: string | null;
  declare format: string | null;
  declare actorLabel: string | null;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): typeof Snapshot {
    return Snapshot.init(
      {
        id: { type: DataTypes.UUID, defaultValue: DataTypes.UUIDV4, primaryKey: true },
        environmentId: { type: DataTypes.UUID, allowNull: false },
        number: { type: DataTypes.INTEGER, allowNull: false },
        hash: { type: DataTypes.STRING(64), allowNull: false },
        content: { type: DataTypes.JSONB, allowNull: false },
        componentCount: { type: DataTypes.INTEGER, allowNull: false },
        dependencyCount: { type: DataTypes.INTEGER, allowNull: false },
        undeclaredCount: { type: DataTypes.INTEGER, allowNull: false },
        sourceName: { type: DataTypes.STRING(128), allowNull: true },
        format: { type: DataTypes.STRING(20), allowNull: true },
        actorLabel: { type: DataTypes.STRING(320), allowNull: true },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: "snapshots", underscored: true, updatedAt: false },
    );
  }
}

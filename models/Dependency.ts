import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";
import { STRENGTHS, type Strength } from "../lib/inventory/types";

/** A declared edge from the dependent to what it needs. Keys, not ids: a push replaces rows wholesale. */
export class Dependency extends Model<InferAttributes<Dependency>, InferCreationAttributes<Dependency>> {
  declare id: CreationOptional<string>;
  declare environmentId: string;
  declare fromKey: string;
  declare toKey: string;
  declare strength: Strength;
  /** Members of one any_of group on one component share this id; null for a plain need. */
  declare groupId: string | null;
  declare via: string | null;
  declare sourceId: string;

  static initModel(sequelize: Sequelize): typeof Dependency {
    return Dependency.init(
      {
        id: { type: DataTypes.UUID, defaultValue: DataTypes.UUIDV4, primaryKey: true },
        environmentId: { type: DataTypes.UUID, allowNull: false },
        fromKey: { type: DataTypes.STRING(128), allowNull: false },
        toKey: { type: DataTypes.STRING(128), allowNull: false },
        strength: { type: DataTypes.ENUM(...STRENGTHS), allowNull: false },
        groupId: { type: DataTypes.STRING(600), allowNull: true },
        via: { type: DataTypes.STRING(100), allowNull: true },
        sourceId: { type: DataTypes.UUID, allowNull: false },
      },
      { sequelize, tableName: "dependencies", underscored: true, timestamps: false },
    );
  }
}

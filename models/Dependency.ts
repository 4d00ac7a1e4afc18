import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";
import { STRENGTHS, type FilePosition, type Provenance, type Strength } from "../lib/inventory/types";

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
  /** declared, inferred (a host name in configuration), observed (traces) */
  declare provenance: CreationOptional<Provenance[]>;
  /** The alias the source wrote, when `toKey` is the component it resolves to. */
  declare writtenTo: CreationOptional<string | null>;
  /** Where an inferred need was found in the pushed files. */
  declare origin: CreationOptional<FilePosition | null>;

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
        provenance: { type: DataTypes.ARRAY(DataTypes.TEXT), allowNull: false, defaultValue: ["declared"] },
        writtenTo: { type: DataTypes.STRING(128), allowNull: true },
        origin: { type: DataTypes.JSONB, allowNull: true },
      },
      { sequelize, tableName: "dependencies", underscored: true, timestamps: false },
    );
  }
}

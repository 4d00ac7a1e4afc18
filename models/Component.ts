import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";
import { COMPONENT_KINDS, type ComponentKind, type Tier } from "../lib/inventory/types";

/** The current state of a component in an environment; its history lives in snapshots. */
export class Component extends Model<InferAttributes<Component>, InferCreationAttributes<Component>> {
  declare id: CreationOptional<string>;
  declare environmentId: string;
  declare key: string;
  declare name: string;
  declare kind: ComponentKind;
  /** Team slug as declared by the source; an owner assigned in Pinchpoint is an annotation. */
  declare team: string | null;
  declare tier: Tier;
  declare replicas: number;
  declare zones: string[];
  declare tags: string[];
  declare links: Record<string, string>;
  /** Other names it is known by (keys and aliases are one namespace per environment). */
  declare aliases: CreationOptional<string[]>;
  /** null for an `undeclared` placeholder */
  declare sourceId: string | null;

  static initModel(sequelize: Sequelize): typeof Component {
    return Component.init(
      {
        id: { type: DataTypes.UUID, defaultValue: DataTypes.UUIDV4, primaryKey: true },
        environmentId: { type: DataTypes.UUID, allowNull: false },
        key: { type: DataTypes.STRING(128), allowNull: false },
        name: { type: DataTypes.STRING(200), allowNull: false },
        kind: { type: DataTypes.ENUM(...COMPONENT_KINDS, "undeclared"), allowNull: false },
        team: { type: DataTypes.STRING(63), allowNull: true },
        tier: { type: DataTypes.SMALLINT, allowNull: false },
        replicas: { type: DataTypes.INTEGER, allowNull: false },
        zones: { type: DataTypes.ARRAY(DataTypes.TEXT), allowNull: false },
        tags: { type: DataTypes.ARRAY(DataTypes.TEXT), allowNull: false },
        links: { type: DataTypes.JSONB, allowNull: false },
        aliases: { type: DataTypes.ARRAY(DataTypes.TEXT), allowNull: false, defaultValue: [] },
        sourceId: { type: DataTypes.UUID, allowNull: true },
      },
      { sequelize, tableName: "components", underscored: true, timestamps: false },
    );
  }
}

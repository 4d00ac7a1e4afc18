import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";

/**
 * What people add in Pinchpoint to a component: an owner team and notes. Keyed by environment
 * and component key, so it survives pushes that replace the declared rows.
 */
export class ComponentAnnotation extends Model<InferAttributes<ComponentAnnotation>, InferCreationAttributes<ComponentAnnotation>> {
  declare id: CreationOptional<string>;
  declare environmentId: string;
  declare key: string;
  declare ownerTeam: string | null;
  declare notes: string | null;
  declare updatedBy: string | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): typeof ComponentAnnotation {
    return ComponentAnnotation.init(
      {
        id: { type: DataTypes.UUID, defaultValue: DataTypes.UUIDV4, primaryKey: true },
        environmentId: { type: DataTypes.UUID, allowNull: false },
        key: { type: DataTypes.STRING(128), allowNull: false },
        ownerTeam: { type: DataTypes.STRING(63), allowNull: true },
        notes: { type: DataTypes.TEXT, allowNull: true },
        updatedBy: { type: DataTypes.UUID, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: "component_annotations", underscored: true },
    );
  }
}

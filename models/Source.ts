import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";

/** Who declared a set of components in one environment (usually one repository). */
export class Source extends Model<InferAttributes<Source>, InferCreationAttributes<Source>> {
  declare id: CreationOptional<string>;
  declare environmentId: string;
  declare name: string;
  declare lastFormat: string | null;
  declare lastPushAt: Date | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): typeof Source {
    return Source.init(
      {
        id: { type: DataTypes.UUID, defaultValue: DataTypes.UUIDV4, primaryKey: true },
        environmentId: { type: DataTypes.UUID, allowNull: false },
        name: { type: DataTypes.STRING(128), allowNull: false },
        lastFormat: { type: DataTypes.STRING(20), allowNull: true },
        lastPushAt: { type: DataTypes.DATE, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: "sources", underscored: true },
    );
  }
}

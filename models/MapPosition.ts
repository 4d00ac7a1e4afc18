import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";

/** A position someone pinned on an environment's map; shared by everyone who opens that map. */
export class MapPosition extends Model<InferAttributes<MapPosition>, InferCreationAttributes<MapPosition>> {
  declare id: CreationOptional<string>;
  declare environmentId: string;
  declare key: string;
  declare x: number;
  declare y: number;
  declare updatedBy: string | null;

  static initModel(sequelize: Sequelize): typeof MapPosition {
    return MapPosition.init(
      {
        id: { type: DataTypes.UUID, defaultValue: DataTypes.UUIDV4, primaryKey: true },
        environmentId: { type: DataTypes.UUID, allowNull: false },
        key: { type: DataTypes.STRING(128), allowNull: false },
        x: { type: DataTypes.DOUBLE, allowNull: false },
        y: { type: DataTypes.DOUBLE, allowNull: false },
        updatedBy: { type: DataTypes.UUID, allowNull: true },
      },
      { sequelize, tableName: "map_positions", underscored: true, timestamps: false },
    );
  }
}

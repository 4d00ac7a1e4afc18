import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";

export class Team extends Model<InferAttributes<Team>, InferCreationAttributes<Team>> {
  declare id: CreationOptional<string>;
  declare slug: string;
  declare name: string;
  declare email: string | null;
  /** Where to page this team: a rota name, a phone number, a channel. */
  declare oncall: string | null;
  declare description: string | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): typeof Team {
    return Team.init(
      {
        id: { type: DataTypes.UUID, defaultValue: DataTypes.UUIDV4, primaryKey: true },
        slug: { type: DataTypes.STRING(63), allowNull: false, unique: true },
        name: { type: DataTypes.STRING(200), allowNull: false },
        email: { type: DataTypes.STRING(320), allowNull: true },
        oncall: { type: DataTypes.STRING(200), allowNull: true },
        description: { type: DataTypes.TEXT, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: "teams", underscored: true },
    );
  }
}

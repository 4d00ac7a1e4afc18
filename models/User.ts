import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";
import { ROLES, type Role } from "../lib/auth/roles";

export class User extends Model<InferAttributes<User>, InferCreationAttributes<User>> {
  declare id: CreationOptional<string>;
  declare email: string;
  declare name: string;
  /** bcrypt hash; null for accounts that only sign in through single sign-on or have not accepted an invite */
  declare passwordHash: string | null;
  declare role: Role;
  declare active: CreationOptional<boolean>;
  /** `sub` of the OpenID Connect identity linked to this account */
  declare oidcSubject: string | null;
  /** sessions issued under an older version are refused (see lib/auth/actor.ts) */
  declare sessionVersion: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): typeof User {
    return User.init(
      {
        id: { type: DataTypes.UUID, defaultValue: DataTypes.UUIDV4, primaryKey: true },
        email: { type: DataTypes.STRING(320), allowNull: false, unique: true },
        name: { type: DataTypes.STRING(200), allowNull: false },
        passwordHash: { type: DataTypes.STRING(100), allowNull: true },
        role: { type: DataTypes.ENUM(...ROLES), allowNull: false },
        active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
        oidcSubject: { type: DataTypes.STRING(255), allowNull: true, unique: true },
        sessionVersion: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: "users", underscored: true },
    );
  }
}

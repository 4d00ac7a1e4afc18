import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";
import { TOKEN_SCOPES, type TokenScope } from "../lib/auth/roles";

/** A bearer token for CI and scripts. Only a sha256 of the secret is stored. */
export class ApiToken extends Model<InferAttributes<ApiToken>, InferCreationAttributes<ApiToken>> {
  declare id: CreationOptional<string>;
  declare name: string;
  /** the first characters of the token, shown in lists so people can tell tokens apart */
  declare prefix: string;
  declare secretHash: string;
  declare scopes: TokenScope[];
  declare environmentId: string | null;
  declare sourceName: string | null;
  declare createdBy: string | null;
  declare lastUsedAt: Date | null;
  declare revokedAt: Date | null;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): typeof ApiToken {
    return ApiToken.init(
      {
        id: { type: DataTypes.UUID, defaultValue: DataTypes.UUIDV4, primaryKey: true },
        name: { type: DataTypes.STRING(100), allowNull: false },
        prefix: { type: DataTypes.STRING(16), allowNull: false },
        secretHash: { type: DataTypes.STRING(64), allowNull: false, unique: true },
        scopes: { type: DataTypes.ARRAY(DataTypes.ENUM(...TOKEN_SCOPES)), allowNull: false },
        environmentId: { type: DataTypes.UUID, allowNull: true },
        sourceName: { type: DataTypes.STRING(128), allowNull: true },
        createdBy: { type: DataTypes.UUID, allowNull: true },
        lastUsedAt: { type: DataTypes.DATE, allowNull: true },
        revokedAt: { type: DataTypes.DATE, allowNull: true },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: "api_tokens", underscored: true, updatedAt: false },
    );
  }
}

import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";

/** Failed sign-ins, kept in PostgreSQL so that every app instance sees the same rate limit. */
export class SignInAttempt extends Model<InferAttributes<SignInAttempt>, InferCreationAttributes<SignInAttempt>> {
  declare id: CreationOptional<number>;
  /** `account:<email>` or `address:<ip>` */
  declare bucket: string;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): typeof SignInAttempt {
    return SignInAttempt.init(
      {
        id: { type: DataTypes.BIGINT, autoIncrement: true, primaryKey: true },
        bucket: { type: DataTypes.STRING(400), allowNull: false },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: "sign_in_attempts", underscored: true, updatedAt: false },
    );
  }
}

import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";

/** Every write, with who, when, what, before and after. Append-only. */
export class AuditEvent extends Model<InferAttributes<AuditEvent>, InferCreationAttributes<AuditEvent>> {
  declare id: CreationOptional<string>;
  declare actorType: "user" | "token" | "system";
  declare actorId: string | null;
  declare actorLabel: string;
  declare action: string;
  declare targetType: string;
  declare targetId: string;
  declare environmentId: string | null;
  declare before: unknown;
  declare after: unknown;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): typeof AuditEvent {
    return AuditEvent.init(
      {
        id: { type: DataTypes.UUID, defaultValue: DataTypes.UUIDV4, primaryKey: true },
        actorType: { type: DataTypes.STRING(10), allowNull: false },
        actorId: { type: DataTypes.STRING(64), allowNull: true },
        actorLabel: { type: DataTypes.STRING(320), allowNull: false },
        action: { type: DataTypes.STRING(64), allowNull: false },
        targetType: { type: DataTypes.STRING(40), allowNull: false },
        targetId: { type: DataTypes.STRING(200), allowNull: false },
        environmentId: { type: DataTypes.UUID, allowNull: true },
        before: { type: DataTypes.JSONB, allowNull: true },
        after: { type: DataTypes.JSONB, allowNull: true },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: "audit_events", underscored: true, updatedAt: false },
    );
  }
}

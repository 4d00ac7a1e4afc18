import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";

const OUTBOX_STATUSES = ["queued", "sent", "failed"] as const;
export type OutboxStatus = (typeof OUTBOX_STATUSES)[number];

/** One e-mail waiting to be sent, sent, or given up on: the product's record of it; its delivery is a job in the queue `mail` (lib/data/mail-outbox.ts). */
export class OutboxMessage extends Model<InferAttributes<OutboxMessage>, InferCreationAttributes<OutboxMessage>> {
  declare id: CreationOptional<string>;
  declare to: string[];
  declare subject: string;
  declare text: string;
  declare html: string;
  declare template: string;
  declare status: CreationOptional<OutboxStatus>;
  declare attempts: CreationOptional<number>;
  declare lastError: string | null;
  /** the job of the queue `mail` that delivers it */
  declare jobId: CreationOptional<string | null>;
  declare dedupeKey: string | null;
  declare createdAt: CreationOptional<Date>;
  declare sentAt: Date | null;

  static initModel(sequelize: Sequelize): typeof OutboxMessage {
    return OutboxMessage.init(
      {
        id: { type: DataTypes.UUID, defaultValue: DataTypes.UUIDV4, primaryKey: true },
        to: { type: DataTypes.ARRAY(DataTypes.TEXT), allowNull: false },
        subject: { type: DataTypes.STRING(300), allowNull: false },
        text: { type: DataTypes.TEXT, allowNull: false },
        html: { type: DataTypes.TEXT, allowNull: false },
        template: { type: DataTypes.STRING(40), allowNull: false },
        status: { type: DataTypes.ENUM(...OUTBOX_STATUSES), allowNull: false, defaultValue: "queued" },
        attempts: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        lastError: { type: DataTypes.TEXT, allowNull: true },
        jobId: { type: DataTypes.UUID, allowNull: true },
        dedupeKey: { type: DataTypes.STRING(300), allowNull: true },
        createdAt: DataTypes.DATE,
        sentAt: { type: DataTypes.DATE, allowNull: true },
      },
      { sequelize, tableName: "outbox_messages", underscored: true, updatedAt: false },
    );
  }
}

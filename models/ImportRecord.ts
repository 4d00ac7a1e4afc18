import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";

/** One accepted push or upload: who, when, source, format, result. */
export class ImportRecord extends Model<InferAttributes<ImportRecord>, InferCreationAttributes<ImportRecord>> {
  declare id: CreationOptional<string>;
  declare environmentId: string;
  declare sourceName: string;
  declare format: string;
  declare actorLabel: string;
  declare graphChanged: boolean;
  declare snapshotNumber: number | null;
  declare summary: Record<string, number>;
  declare warnings: { path: string; line?: number; column?: number; message: string }[];
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): typeof ImportRecord {
    return ImportRecord.init(
      {
        id: { type: DataTypes.UUID, defaultValue: DataTypes.UUIDV4, primaryKey: true },
        environmentId: { type: DataTypes.UUID, allowNull: false },
        sourceName: { type: DataTypes.STRING(128), allowNull: false },
        format: { type: DataTypes.STRING(20), allowNull: false },
        actorLabel: { type: DataTypes.STRING(320), allowNull: false },
        graphChanged: { type: DataTypes.BOOLEAN, allowNull: false },
        snapshotNumber: { type: DataTypes.INTEGER, allowNull: true },
        summary: { type: DataTypes.JSONB, allowNull: false },
        warnings: { type: DataTypes.JSONB, allowNull: false },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: "import_records", underscored: true, updatedAt: false },
    );
  }
}

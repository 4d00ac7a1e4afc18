import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";

/** `superseded`: a newer snapshot of the environment was analysed instead (lib/data/analysis-runs.ts). */
const ANALYSIS_STATUSES = ["queued", "running", "done", "failed", "superseded"] as const;
export type AnalysisStatus = (typeof ANALYSIS_STATUSES)[number];

/** One analysis of one snapshot: the product's record of it (status, progress, phase, summary); the queue job that runs it is pg-boss's (job_id). */
export class AnalysisRun extends Model<InferAttributes<AnalysisRun>, InferCreationAttributes<AnalysisRun>> {
  declare id: CreationOptional<string>;
  declare environmentId: string;
  declare snapshotId: string;
  declare status: AnalysisStatus;
  declare progress: CreationOptional<number>;
  declare phase: string | null;
  declare attempts: CreationOptional<number>;
  /** worker that holds the run and when it last said it is alive; a stale heartbeat hands it back to the queue */
  declare lockedBy: string | null;
  /** the pg-boss job (queue `analysis`) that claimed this run last */
  declare jobId: CreationOptional<string | null>;
  declare heartbeatAt: Date | null;
  declare startedAt: Date | null;
  declare finishedAt: Date | null;
  declare error: string | null;
  declare exact: boolean | null;
  declare sampleSize: number | null;
  declare timings: Record<string, number> | null;
  /** a small summary of graph-level results (counts, convergence, weights); the results themselves live in component_metrics, component_dominance and analysis_cycles */
  declare graph: unknown;
  /** bridges of the undirected projection, as [key, key] pairs (the impact of a push compares them) */
  declare bridges: Array<[string, string]> | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): typeof AnalysisRun {
    return AnalysisRun.init(
      {
        id: { type: DataTypes.UUID, defaultValue: DataTypes.UUIDV4, primaryKey: true },
        environmentId: { type: DataTypes.UUID, allowNull: false },
        snapshotId: { type: DataTypes.UUID, allowNull: false, unique: true },
        status: { type: DataTypes.ENUM(...ANALYSIS_STATUSES), allowNull: false },
        progress: { type: DataTypes.REAL, allowNull: false, defaultValue: 0 },
        phase: { type: DataTypes.STRING(60), allowNull: true },
        attempts: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        lockedBy: { type: DataTypes.STRING(100), allowNull: true },
        jobId: { type: DataTypes.UUID, allowNull: true },
        heartbeatAt: { type: DataTypes.DATE, allowNull: true },
        startedAt: { type: DataTypes.DATE, allowNull: true },
        finishedAt: { type: DataTypes.DATE, allowNull: true },
        error: { type: DataTypes.TEXT, allowNull: true },
        exact: { type: DataTypes.BOOLEAN, allowNull: true },
        sampleSize: { type: DataTypes.INTEGER, allowNull: true },
        timings: { type: DataTypes.JSONB, allowNull: true },
        graph: { type: DataTypes.JSONB, allowNull: true },
        bridges: { type: DataTypes.JSONB, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: "analysis_runs", underscored: true },
    );
  }
}

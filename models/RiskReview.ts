import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";

import { REVIEW_STATUSES, type ReviewStatus } from "../lib/review-status";

export { type ReviewStatus };

/**
 * An architect's decision about one pinch point. Keyed by environment and component key (like
 * annotations) so it survives pushes; the history of changes lives in the audit log.
 */
export class RiskReview extends Model<InferAttributes<RiskReview>, InferCreationAttributes<RiskReview>> {
  declare id: CreationOptional<string>;
  declare environmentId: string;
  declare key: string;
  declare status: ReviewStatus;
  declare rationale: string;
  /** calendar date (YYYY-MM-DD); required while a risk is accepted or being mitigated */
  declare reviewBy: string | null;
  declare reviewerId: string | null;
  /** when the reviewer was told the review-by date had come; cleared when the date changes */
  declare notifiedAt: Date | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): typeof RiskReview {
    return RiskReview.init(
      {
        id: { type: DataTypes.UUID, defaultValue: DataTypes.UUIDV4, primaryKey: true },
        environmentId: { type: DataTypes.UUID, allowNull: false },
        key: { type: DataTypes.STRING(128), allowNull: false },
        status: { type: DataTypes.ENUM(...REVIEW_STATUSES), allowNull: false },
        rationale: { type: DataTypes.TEXT, allowNull: false },
        reviewBy: { type: DataTypes.DATEONLY, allowNull: true },
        reviewerId: { type: DataTypes.UUID, allowNull: true },
        notifiedAt: { type: DataTypes.DATE, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: "risk_reviews", underscored: true },
    );
  }
}

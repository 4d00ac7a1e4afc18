// The one Sequelize instance and its initialised models.
//
// Next copies a module into each server bundle, so module-level singletons can exist twice.
// The instance and the model classes it initialised are kept together on globalThis, and every
// caller reaches models through `db().models`, never by importing a class directly.
import pg from "pg";
import { Sequelize } from "sequelize";
import { ApiToken } from "./ApiToken";
import { AuditEvent } from "./AuditEvent";
import { Component } from "./Component";
import { ComponentAnnotation } from "./ComponentAnnotation";
import { Dependency } from "./Dependency";
import { Environment } from "./Environment";
import { ImportRecord } from "./ImportRecord";
import { Membership } from "./Membership";
import { SignInAttempt } from "./SignInAttempt";
import { Snapshot } from "./Snapshot";
import { Source } from "./Source";
import { Team } from "./Team";
import { User } from "./User";
import { AnalysisRun } from "./AnalysisRun";
import { ComponentMetric } from "./ComponentMetric";
import { AnalysisCycle } from "./AnalysisCycle";
import { ComponentDominance } from "./ComponentDominance";
import { MapPosition } from "./MapPosition";
// invites (admin users screen)
import { Invite } from "./Invite";
import { RiskReview } from "./RiskReview";
import { OutboxMessage } from "./OutboxMessage";
import { ChangePolicy } from "./ChangePolicy";

function initModels(sequelize: Sequelize) {
  return {
    User: User.initModel(sequelize),
    Team: Team.initModel(sequelize),
    Membership: Membership.initModel(sequelize),
    Environment: Environment.initModel(sequelize),
    Source: Source.initModel(sequelize),
    Component: Component.initModel(sequelize),
    Dependency: Dependency.initModel(sequelize),
    ComponentAnnotation: ComponentAnnotation.initModel(sequelize),
    Snapshot: Snapshot.initModel(sequelize),
    ImportRecord: ImportRecord.initModel(sequelize),
    ApiToken: ApiToken.initModel(sequelize),
    AuditEvent: AuditEvent.initModel(sequelize),
    SignInAttempt: SignInAttempt.initModel(sequelize),
    AnalysisRun: AnalysisRun.initModel(sequelize),
    ComponentMetric: ComponentMetric.initModel(sequelize),
    AnalysisCycle: AnalysisCycle.initModel(sequelize),
    ComponentDominance: ComponentDominance.initModel(sequelize),
    MapPosition: MapPosition.initModel(sequelize),
    // invites (admin users screen)
    Invite: Invite.initModel(sequelize),
    RiskReview: RiskReview.initModel(sequelize),
    OutboxMessage: OutboxMessage.initModel(sequelize),
    ChangePolicy: ChangePolicy.initModel(sequelize),
  };
}

type Models = ReturnType<typeof initModels>;
export interface Db {
  sequelize: Sequelize;
  models: Models;
}

const holder = globalThis as unknown as { __pinchpointDb?: Db };

function databaseUrl(): string {
  const url = process.env.DATABASE_URL;
  if (!url) {
    throw new Error("DATABASE_URL is not set: start PostgreSQL with `npm start` (or scripts/pg.sh start) first");
  }
  return url;
}

export function db(): Db {
  if (!holder.__pinchpointDb) {
    const sequelize = new Sequelize(databaseUrl(), {
      dialect: "postgres",
      dialectModule: pg,
      logging: process.env.PINCHPOINT_SQL_LOG === "1" ? console.log : false,
      // Fail in seconds, not a minute, when PostgreSQL is away: callers answer 503 and are told to retry.
      pool: { max: Number(process.env.PINCHPOINT_DB_POOL ?? 10), min: 0, idle: 10_000, acquire: 10_000 },
      dialectOptions: { connectionTimeoutMillis: 5_000 },
    });
    holder.__pinchpointDb = { sequelize, models: initModels(sequelize) };
  }
  return holder.__pinchpointDb;
}

/** For scripts and tests: close the pool so the process can exit. */
export async function closeDb(): Promise<void> {
  const current = holder.__pinchpointDb;
  holder.__pinchpointDb = undefined;
  if (current) await current.sequelize.close();
}

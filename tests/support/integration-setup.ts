// Per test file: a fresh database copied from the migrated template, dropped afterwards.
import { randomBytes } from "node:crypto";
import { afterAll, beforeAll } from "vitest";
import { closeDb } from "@/models";
import { createDatabaseFromTemplate, dropDatabase } from "./test-db";

const name = `pp_test_${process.pid}_${randomBytes(4).toString("hex")}`;
process.env.NEXTAUTH_SECRET ??= "test-secret-not-for-production";

beforeAll(async () => {
  process.env.DATABASE_URL = await createDatabaseFromTemplate(name);
});

afterAll(async () => {
  await closeDb();
  await dropDatabase(name);
});

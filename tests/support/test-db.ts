// Test databases: a template migrated once per run, and a fresh copy of it per test file, so every
// file is isolated and none touches the demo's data. Real PostgreSQL, never a stand-in.
import pg from "pg";

function adminUrl(): string {
  const url = process.env.PINCHPOINT_TEST_ADMIN_URL;
  if (!url) throw new Error("PINCHPOINT_TEST_ADMIN_URL is not set: run the suite with `npm test`, which starts its own PostgreSQL");
  return url;
}

export function urlFor(database: string): string {
  const url = new URL(adminUrl());
  url.pathname = `/${database}`;
  return url.toString();
}

export const TEMPLATE_DB = "pp_test_template";

export async function withAdmin<T>(fn: (client: pg.Client) => Promise<T>): Promise<T> {
  const client = new pg.Client({ connectionString: adminUrl() });
  await client.connect();
  try {
    return await fn(client);
  } finally {
    await client.end();
  }
}

export async function createDatabaseFromTemplate(name: string): Promise<string> {
  await withAdmin((c) => c.query(`CREATE DATABASE "${name}" TEMPLATE "${TEMPLATE_DB}"`));
  return urlFor(name);
}

export async function dropDatabase(name: string): Promise<void> {
  await withAdmin((c) => c.query(`DROP DATABASE IF EXISTS "${name}" WITH (FORCE)`));
}

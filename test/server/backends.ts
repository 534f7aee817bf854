import { randomBytes } from 'node:crypto';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import pg from 'pg';
import { describe } from 'vitest';
import { openPgStore, type PgStore } from '../../src/server/store/pg-store';
import type { ServerStore } from '../../src/server/store/server-store';
import { openSqliteStore, type SqliteStore } from '../../src/server/store/sqlite-store';

/**
 * The two store back-ends the server tests run on. SQLite always runs. PostgreSQL runs when
 * DATABASE_URL is set; without it those runs are skipped with a message saying how to get one,
 * and with PLUMBLINE_REQUIRE_POSTGRES=1 (set by .ci/run) a missing DATABASE_URL fails instead.
 * Each PostgreSQL store lives in its own fresh schema (t_<random>), dropped when it is disposed,
 * so test files running side by side never see each other's rows.
 */
export type Backend = 'sqlite' | 'postgres';
export const BACKENDS: readonly Backend[] = ['sqlite', 'postgres'];

export const DATABASE_URL = process.env.DATABASE_URL?.trim() || undefined;

export const HOW_TO_RUN_POSTGRES =
  'To run them: apt-get install -y postgresql, then `bash test/server/with-postgres.sh npx vitest run --project server` ' +
  '(starts a throwaway cluster in /tmp, sets DATABASE_URL, removes the cluster afterwards), ' +
  'or set DATABASE_URL=postgres://user@host:port/db yourself. DEVELOPERS.md, section PostgreSQL, has the steps.';

let announced = false;
/** True when the PostgreSQL runs can run; throws in CI when they cannot; otherwise warns once per file. */
export function postgresAvailable(): boolean {
  if (DATABASE_URL) return true;
  if (process.env.PLUMBLINE_REQUIRE_POSTGRES === '1') {
    throw new Error(`PLUMBLINE_REQUIRE_POSTGRES=1 requires the PostgreSQL runs of the server tests, but DATABASE_URL is not set. ${HOW_TO_RUN_POSTGRES}`);
  }
  if (!announced) console.warn(`[postgres skipped] DATABASE_URL is not set, so the PostgreSQL runs of the server tests are skipped. ${HOW_TO_RUN_POSTGRES}`);
  announced = true;
  return false;
}

/** `describe(name [backend])` once per back-end; the PostgreSQL one is skipped without DATABASE_URL. */
export function describeBackends(name: string, body: (backend: Backend) => void): void {
  for (const backend of BACKENDS) {
    if (backend === 'postgres') describe.skipIf(!postgresAvailable())(`${name} [postgres]`, () => body(backend));
    else describe(`${name} [sqlite]`, () => body(backend));
  }
}

/** Raw SQL for checks the store interface does not offer. Write `?` placeholders; they become $1, $2, … on PostgreSQL. */
export type SqlRunner = <Row = Record<string, unknown>>(text: string, ...params: unknown[]) => Promise<Row[]>;

export interface TestStore {
  readonly backend: Backend;
  readonly store: ServerStore;
  readonly sql: SqlRunner;
  dispose(): Promise<void>;
}

/** A fresh, empty store on the given back-end. */
export async function openTestStore(backend: Backend): Promise<TestStore> {
  if (backend === 'sqlite') {
    const dir = mkdtempSync(join(tmpdir(), 'plumbline-store-'));
    const store = openSqliteStore(join(dir, 'store.sqlite'));
    return {
      backend,
      store,
      sql: sqliteRunner(store),
      dispose: async () => {
        await store.close();
        rmSync(dir, { recursive: true, force: true });
      },
    };
  }
  const schema = await createTestSchema();
  try {
    const store = await openPgStore(requireDatabaseUrl(), { schema: schema.name, max: 4, applicationName: `plumbline-test-${schema.name}` });
    return {
      backend,
      store,
      sql: pgRunner(store),
      dispose: async () => {
        await store.close();
        await schema.drop();
      },
    };
  } catch (error) {
    await schema.drop();
    throw error;
  }
}

export function sqliteRunner(store: SqliteStore): SqlRunner {
  return async <Row>(text: string, ...params: unknown[]) => store.db.prepare(text).all(...params) as Row[];
}

export function pgRunner(store: PgStore): SqlRunner {
  return async <Row>(text: string, ...params: unknown[]) => {
    let n = 0;
    const { rows } = await store.pool.query(text.replace(/\?/g, () => `$${++n}`), params);
    return rows as Row[];
  };
}

export function requireDatabaseUrl(): string {
  if (!DATABASE_URL) throw new Error(`DATABASE_URL is not set. ${HOW_TO_RUN_POSTGRES}`);
  return DATABASE_URL;
}

/** A new empty schema t_<random> in the DATABASE_URL database; drop() removes it with everything in it. */
export async function createTestSchema(): Promise<{ name: string; drop: () => Promise<void> }> {
  const name = `t_${randomBytes(6).toString('hex')}`;
  await withAdmin((c) => c.query(`CREATE SCHEMA ${name}`));
  return { name, drop: () => withAdmin((c) => c.query(`DROP SCHEMA ${name} CASCADE`)).then(() => undefined) };
}

/** Runs work on a short-lived connection of its own (not in any test schema). */
export async function withAdmin<T>(work: (client: pg.Client) => Promise<T>): Promise<T> {
  const client = new pg.Client({ connectionString: requireDatabaseUrl(), application_name: 'plumbline-test-admin' });
  await client.connect();
  try {
    return await work(client);
  } finally {
    await client.end();
  }
}

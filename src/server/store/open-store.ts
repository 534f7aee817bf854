import { mkdirSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import { openPgStore } from './pg-store';
import type { ServerStore } from './server-store';
import { openSqliteStore } from './sqlite-store';

export interface OpenedStore {
  readonly store: ServerStore;
  readonly backend: 'postgresql' | 'sqlite';
  /** Where the data lives, safe to print: the SQLite file, or the PostgreSQL URL without its password. */
  readonly location: string;
}

/**
 * Opens the server's store: PostgreSQL when a database URL is given (DATABASE_URL), otherwise the
 * SQLite file at `sqlitePath` (its folder is created if needed).
 */
export async function openStore(target: { databaseUrl?: string | undefined; sqlitePath: string }): Promise<OpenedStore> {
  const url = target.databaseUrl?.trim();
  if (url) {
    if (!/^postgres(ql)?:\/\//.test(url)) throw new Error(`DATABASE_URL must start with postgres:// or postgresql://, not "${redactUrl(url)}".`);
    try {
      return { store: await openPgStore(url), backend: 'postgresql', location: redactUrl(url) };
    } catch (error) {
      const reason = error instanceof Error ? error.message : String(error);
      throw new Error(`Cannot open the PostgreSQL store at ${redactUrl(url)}: ${reason}`, { cause: error });
    }
  }
  const path = resolve(target.sqlitePath);
  mkdirSync(dirname(path), { recursive: true });
  return { store: openSqliteStore(path), backend: 'sqlite', location: path };
}

/** The URL with any password replaced by "***". */
export function redactUrl(url: string): string {
  try {
    const u = new URL(url);
    if (u.password) u.password = '***';
    return u.toString();
  } catch {
    return url.replace(/\/\/([^:/@]*):[^@]*@/, '//$1:***@');
  }
}

/**
 * `npm test` finds the system's PostgreSQL: when DATABASE_URL is not set and Debian's server
 * binaries are installed (apt-get install -y postgresql), a throwaway cluster is started in /tmp
 * on a free port for the server suite and removed afterwards. Without the binaries nothing
 * happens and the PostgreSQL runs skip with a message (or fail under PLUMBLINE_REQUIRE_POSTGRES=1).
 */
import { execFileSync } from 'node:child_process';
import { chownSync, existsSync, mkdtempSync, readdirSync, rmSync } from 'node:fs';
import { createServer } from 'node:net';
import { userInfo } from 'node:os';
import { join } from 'node:path';

function pgBin(): string | undefined {
  const root = '/usr/lib/postgresql';
  if (!existsSync(root)) return undefined;
  const versions = readdirSync(root).filter((v) => existsSync(join(root, v, 'bin', 'initdb'))).sort((a, b) => Number(a) - Number(b));
  const v = versions[versions.length - 1];
  return v ? join(root, v, 'bin') : undefined;
}

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const s = createServer().listen(0, '127.0.0.1', () => {
      const a = s.address();
      s.close(() => (a && typeof a === 'object' ? resolve(a.port) : reject(new Error('no port'))));
    });
  });
}

export default async function setup(): Promise<(() => void) | undefined> {
  if (process.env.DATABASE_URL) return undefined;
  const bin = pgBin();
  if (!bin) return undefined;
  const isRoot = process.getuid?.() === 0;
  const run = (cmd: string, args: string[]) =>
    execFileSync(isRoot ? 'runuser' : cmd, isRoot ? ['-u', 'postgres', '--', cmd, ...args] : args, { stdio: 'pipe' });
  const dir = mkdtempSync('/tmp/plumbline-pg-');
  if (isRoot) {
    const uid = Number(execFileSync('id', ['-u', 'postgres']).toString().trim());
    const gid = Number(execFileSync('id', ['-g', 'postgres']).toString().trim());
    chownSync(dir, uid, gid);
  }
  const user = isRoot ? 'postgres' : userInfo().username;
  const port = await freePort();
  try {
    run(join(bin, 'initdb'), ['-D', join(dir, 'data'), '-U', user, '-A', 'trust', '--no-sync', '-E', 'UTF8']);
    run(join(bin, 'pg_ctl'), ['-D', join(dir, 'data'), '-l', join(dir, 'log'), '-w', '-o',
      `-p ${port} -k ${dir} -c listen_addresses=127.0.0.1 -c fsync=off -c full_page_writes=off`, 'start']);
  } catch (e) {
    console.warn(`[postgres] could not start a throwaway cluster (${e instanceof Error ? e.message.split('\n')[0] : e}); the PostgreSQL runs will skip.`);
    rmSync(dir, { recursive: true, force: true });
    return undefined;
  }
  process.env.DATABASE_URL = `postgres://${user}@127.0.0.1:${port}/postgres`;
  console.log(`[postgres] throwaway cluster for the server suite at ${process.env.DATABASE_URL}`);
  return () => {
    try {
      run(join(bin, 'pg_ctl'), ['-D', join(dir, 'data'), '-m', 'immediate', 'stop']);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  };
}

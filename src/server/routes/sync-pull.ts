import type { FastifyInstance } from 'fastify';
import { MAX_PULL_PAGE, type PullResponse } from '../../schema/index';
import { authenticateDevice } from '../auth';
import { HttpError } from '../http-error';
import type { ServerContext } from '../server-context';

export const DEFAULT_PULL_PAGE = 200;

/** GET /api/v1/sync/pull?after=N&limit=M: the site's log (set-up and records) in serverSeq order. */
export function registerSyncPullRoute(app: FastifyInstance, ctx: ServerContext): void {
  app.get('/api/v1/sync/pull', async (request): Promise<PullResponse> => {
    const device = await authenticateDevice(ctx, request);
    const query = (request.query ?? {}) as Record<string, unknown>;
    const after = readInteger(query.after, 'after', 0, 0, Number.MAX_SAFE_INTEGER);
    const limit = readInteger(query.limit, 'limit', DEFAULT_PULL_PAGE, 1, MAX_PULL_PAGE);

    // One row more than asked tells whether another page follows.
    const rows = await ctx.store.readLog(device.siteId, after, limit + 1);
    const entries = rows.slice(0, limit);
    return {
      serverEpoch: await ctx.store.getServerEpoch(),
      entries,
      next: entries.at(-1)?.serverSeq ?? after,
      hasMore: rows.length > limit,
    };
  });
}

function readInteger(raw: unknown, name: string, fallback: number, min: number, max: number): number {
  if (raw === undefined || raw === '') return fallback;
  const n = typeof raw === 'string' && /^[0-9]{1,16}$/.test(raw) ? Number(raw) : NaN;
  if (!Number.isSafeInteger(n) || n < min || n > max) {
    throw new HttpError(400, 'bad-request', `The query parameter "${name}" must be a whole number from ${min} to ${max}.`);
  }
  return n;
}

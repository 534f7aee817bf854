import type { FastifyInstance } from 'fastify';
import type { ServerContext } from '../server-context';

/** GET /api/v1/health → {ok, serverEpoch}: the client's "is the server there" probe. */
export function registerHealthRoute(app: FastifyInstance, ctx: ServerContext): void {
  app.get('/api/v1/health', async () => ({ ok: true, serverEpoch: await ctx.store.getServerEpoch() }));
}

import type { FastifyInstance } from 'fastify';
import { authenticateSession, requireRole } from '../auth';
import { HttpError } from '../http-error';
import type { ServerContext } from '../server-context';
import type { DeviceRow } from '../store/server-store';

export interface DeviceListResponse {
  readonly devices: readonly DeviceRow[];
}

/**
 * GET /api/v1/admin/devices (admin session) → {devices}: the site's enrolled tablets.
 * POST /api/v1/admin/devices/:id/revoke (admin session) → 204: the tablet's token stops working.
 */
export function registerAdminDevicesRoutes(app: FastifyInstance, ctx: ServerContext): void {
  app.get('/api/v1/admin/devices', async (request): Promise<DeviceListResponse> => {
    const siteId = await adminSite(ctx, request, 'list tablets');
    return { devices: await ctx.store.listDevices(siteId) };
  });

  app.post<{ Params: { id: string } }>('/api/v1/admin/devices/:id/revoke', async (request, reply) => {
    const siteId = await adminSite(ctx, request, 'withdraw tablets');
    const device = await ctx.store.getDevice(request.params.id);
    if (!device || device.siteId !== siteId) throw new HttpError(404, 'not-found', `There is no tablet "${request.params.id}" at this site.`);
    await ctx.store.revokeDevice(device.id, ctx.now().toISOString());
    request.log.info({ deviceId: device.id }, 'device revoked');
    return reply.code(204).send();
  });
}

async function adminSite(ctx: ServerContext, request: Parameters<typeof authenticateSession>[1], action: string): Promise<string> {
  const { person, siteId } = await authenticateSession(ctx, request);
  requireRole(person, 'admin', action);
  return siteId;
}

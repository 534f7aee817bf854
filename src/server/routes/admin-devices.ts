import type { FastifyInstance } from 'fastify';
import { authenticateSession, requireRole } from '../auth';
import { HttpError } from '../http-error';
import type { ServerContext } from '../server-context';
import type { DeviceListResponse } from '../../schema/index';
import type { SeqCoverage } from '../store/server-store';

/**
 * GET /api/v1/admin/devices (admin session) → {devices}: the site's enrolled tablets, with when each last
 *   sent records and last had someone sign in (what the server knows of them; it does not log pulls), and
 *   which of its record numbers arrived: how many, the highest, and the numbers below it never received.
 * POST /api/v1/admin/devices/:id/revoke (admin session) → 204: the tablet's token stops working.
 * POST /api/v1/admin/devices/:id/reinstate (admin session) → 204: a withdrawn tablet's same token works again, so
 *   the records it kept send at its next sync; a tablet in use stays as it is (idempotent).
 */
export function registerAdminDevicesRoutes(app: FastifyInstance, ctx: ServerContext): void {
  app.get('/api/v1/admin/devices', async (request): Promise<DeviceListResponse> => {
    const siteId = await adminSite(ctx, request, 'list tablets');
    const [devices, activity, coverage] = await Promise.all([ctx.store.listDevices(siteId), ctx.store.listDeviceActivity(siteId), ctx.store.listSeqCoverage(siteId)]);
    const byId = new Map(activity.map((a) => [a.deviceId, a]));
    const seqsOf = new Map(coverage.map((c) => [c.deviceId, c]));
    return {
      devices: devices.map((d) => ({
        id: d.id,
        name: d.name,
        enrolledAt: d.enrolledAt,
        revokedAt: d.revokedAt,
        lastUploadAt: byId.get(d.id)?.lastUploadAt ?? null,
        lastSignInAt: byId.get(d.id)?.lastSignInAt ?? null,
        ...seqFields(seqsOf.get(d.id)),
      })),
    };
  });

  app.post<{ Params: { id: string } }>('/api/v1/admin/devices/:id/revoke', async (request, reply) => {
    const siteId = await adminSite(ctx, request, 'withdraw tablets');
    const device = await ctx.store.getDevice(request.params.id);
    if (!device || device.siteId !== siteId) throw new HttpError(404, 'not-found', `There is no tablet "${request.params.id}" at this site.`);
    await ctx.store.revokeDevice(device.id, ctx.now().toISOString());
    request.log.info({ deviceId: device.id }, 'device revoked');
    return reply.code(204).send();
  });

  app.post<{ Params: { id: string } }>('/api/v1/admin/devices/:id/reinstate', async (request, reply) => {
    const { person, siteId } = await authenticateSession(ctx, request);
    requireRole(person, 'admin', 'reinstate tablets');
    const device = await ctx.store.getDevice(request.params.id);
    if (!device || device.siteId !== siteId) throw new HttpError(404, 'not-found', `There is no tablet "${request.params.id}" at this site.`);
    if (device.revokedAt !== null) {
      await ctx.store.reinstateDevice(device.id);
      request.log.info({ by: person.id, deviceId: device.id, withdrawnAt: device.revokedAt }, 'device reinstated');
    }
    return reply.code(204).send();
  });
}

// The tablet's record numbers as the admin screen shows them (none for a tablet that never sent any).
function seqFields(c: SeqCoverage | undefined): { records?: { received: number; highest: number; missing: number; gaps: { from: number; to: number }[] } } {
  return c ? { records: { received: c.received, highest: c.highest, missing: c.missing, gaps: c.gaps.map((g) => ({ from: g.from, to: g.to })) } } : {};
}

async function adminSite(ctx: ServerContext, request: Parameters<typeof authenticateSession>[1], action: string): Promise<string> {
  const { person, siteId } = await authenticateSession(ctx, request);
  requireRole(person, 'admin', action);
  return siteId;
}

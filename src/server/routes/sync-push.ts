import type { FastifyInstance } from 'fastify';
import { PushRequest, type PushResponse, type PushResult } from '../../schema/index';
import { authenticateDevice } from '../auth';
import { contentHash } from '../canonical-json';
import { checkRecord, SetupLookup } from '../check-record';
import { HttpError } from '../http-error';
import { parseInput } from '../parse-input';
import type { ServerContext } from '../server-context';
import type { RecordToInsert } from '../store/server-store';

/**
 * POST /api/v1/sync/push: each record is checked on its own; every valid one is written in ONE
 * transaction, insert-if-absent by id; the answer is sent only after that commit.
 */
export function registerSyncPushRoute(app: FastifyInstance, ctx: ServerContext): void {
  app.post('/api/v1/sync/push', async (request): Promise<PushResponse> => {
    const device = await authenticateDevice(ctx, request);
    const batch = parseInput(PushRequest, request.body, 'push batch');
    if (batch.deviceSeqs && batch.deviceSeqs.length !== batch.records.length) {
      throw new HttpError(400, 'bad-request', `The push batch has ${batch.records.length} records but ${batch.deviceSeqs.length} device sequence numbers.`);
    }
    const lookup = new SetupLookup(ctx.store);

    const results: (PushResult | undefined)[] = [];
    const toInsert: { index: number; item: RecordToInsert }[] = [];
    for (const [index, raw] of batch.records.entries()) {
      const check = await checkRecord(raw, index, device, lookup);
      if (!check.ok) {
        results[index] = { id: check.id, status: 'rejected', reason: check.reason };
        continue;
      }
      toInsert.push({
        index,
        item: {
          record: check.record,
          siteId: device.siteId,
          contentHash: contentHash(check.record),
          deviceId: device.id,
          personId: check.personId,
          clientTime: check.clientTime,
        },
      });
    }

    const outcomes = toInsert.length > 0 ? await ctx.store.insertRecords(toInsert.map((t) => t.item), ctx.now().toISOString()) : [];
    outcomes.forEach((outcome, i) => {
      const index = toInsert[i]?.index ?? 0;
      results[index] =
        outcome.status === 'conflict'
          ? { id: outcome.id, status: 'conflict', reason: 'A different record with this id is already stored; the stored one was kept unchanged.' }
          : { id: outcome.id, status: outcome.status, serverSeq: outcome.serverSeq };
    });

    // Every number of the batch was received, whatever became of its record (after the records'
    // own commit: a failure here leaves a gap that the tablet's resend fills).
    if (batch.deviceSeqs) {
      const seqs = batch.deviceSeqs;
      await ctx.store.noteDeviceSeqs(device.id, results.map((r, i) => ({ seq: seqs[i]!, recordId: r?.id ?? '' })));
    }

    const counts = { stored: 0, duplicate: 0, conflict: 0, rejected: 0 };
    for (const r of results) if (r) counts[r.status] += 1;
    if (counts.rejected > 0 || counts.conflict > 0) request.log.warn({ deviceId: device.id, batchId: batch.batchId, ...counts }, 'push with problems');
    return { serverEpoch: await ctx.store.getServerEpoch(), results: results.filter((r): r is PushResult => r !== undefined) };
  });
}

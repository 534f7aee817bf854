import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { PushResponse, z, type DeviceRecord } from '../../src/schema/index';
import { api, enrolDevice, makeSample, startTestServer, T0, testUuid, type TestServer } from './fixtures';
import { describeBackends } from './backends';

describeBackends('push', (backend) => {
  let server: TestServer;
  let device: { deviceId: string; deviceToken: string };
  beforeEach(async () => {
    server = await startTestServer({ backend });
    device = await enrolDevice(server);
  });
  afterEach(async () => server.close());

  async function push(records: unknown[], token = device.deviceToken): Promise<PushResponse> {
    const res = await api(server, 'POST', '/api/v1/sync/push', { device: token, body: { batchId: testUuid(), records } });
    expect(res.statusCode).toBe(200);
    return z.parse(PushResponse, res.json());
  }

  const countRecords = async () => Number((await server.sql<{ n: number | string }>(`SELECT COUNT(*) AS n FROM log WHERE entry_kind = 'record'`))[0]?.n);

  describe('POST /api/v1/sync/push', () => {
    it('stores a batch once: the same batch again is all duplicate with the same serverSeqs', async () => {
      const records = [makeSample(device.deviceId), makeSample(device.deviceId, { values: [10.02] })];
      const first = await push(records);
      expect(first.results.map((r) => r.status)).toEqual(['stored', 'stored']);
      const second = await push(records);
      expect(second.results.map((r) => r.status)).toEqual(['duplicate', 'duplicate']);
      expect(second.results.map((r) => r.serverSeq)).toEqual(first.results.map((r) => r.serverSeq));
      expect(await countRecords()).toBe(2);
      expect(second.serverEpoch).toBe(await server.store.getServerEpoch());
    });

    it('treats the same content with keys in another order as a duplicate (canonical hash)', async () => {
      const s = makeSample(device.deviceId);
      await push([s]);
      const reordered = Object.fromEntries(Object.entries(s).reverse());
      expect((await push([reordered])).results[0]?.status).toBe('duplicate');
    });

    it('reports a conflict for the same id with different content and keeps the original', async () => {
      const original = makeSample(device.deviceId, { values: [10.01] });
      const stored = await push([original]);
      const changed = { ...original, values: [10.99] };
      const res = await push([changed]);
      expect(res.results[0]).toMatchObject({ id: original.id, status: 'conflict' });
      expect(res.results[0]?.reason).toMatch(/kept/);
      const row = await server.sql<{ server_seq: number | string; body: string }>(`SELECT server_seq, body FROM log WHERE entity_id = ?`, original.id);
      expect(row).toHaveLength(1);
      expect(Number(row[0]?.server_seq)).toBe(stored.results[0]?.serverSeq);
      expect(JSON.parse(row[0]?.body ?? '{}').values).toEqual([10.01]);
    });

    it('rejects one invalid record with a reason and stores the others of the batch', async () => {
      const good1 = makeSample(device.deviceId);
      const bad = { ...makeSample(device.deviceId), takenAt: 'yesterday' };
      const good2 = makeSample(device.deviceId);
      const res = await push([good1, bad, good2]);
      expect(res.results.map((r) => [r.id, r.status])).toEqual([
        [good1.id, 'stored'],
        [bad.id, 'rejected'],
        [good2.id, 'stored'],
      ]);
      expect(res.results[1]?.reason).toContain('takenAt');
      expect(await countRecords()).toBe(2);
    });

    it('gives a position for a rejected record that has no usable id', async () => {
      const res = await push([{ kind: 'sample' }, 42]);
      expect(res.results.map((r) => [r.id, r.status])).toEqual([
        ['#0', 'rejected'],
        ['#1', 'rejected'],
      ]);
    });

    it('assigns increasing serverSeqs in batch order', async () => {
      const res = await push([makeSample(device.deviceId), makeSample(device.deviceId), makeSample(device.deviceId)]);
      const seqs = res.results.map((r) => r.serverSeq ?? 0);
      expect(seqs[1]).toBeGreaterThan(seqs[0] ?? 0);
      expect(seqs[2]).toBeGreaterThan(seqs[1] ?? 0);
    });

    it('keeps the audit columns: device, person, client time, server time', async () => {
      const s = makeSample(device.deviceId, { takenAt: '2026-11-30T07:59:00.000Z' });
      server.advance(5_000);
      await push([s]);
      const [row] = await server.sql(`SELECT device_id, person_id, client_time, server_time FROM log WHERE entity_id = ?`, s.id);
      expect(row).toEqual({ device_id: device.deviceId, person_id: 'p-op', client_time: '2026-11-30T07:59:00.000Z', server_time: new Date(T0.getTime() + 5_000).toISOString() });
    });

    describe('referential checks', () => {
      it('rejects a record that names another device', async () => {
        const res = await push([makeSample('dev-someone-else')]);
        expect(res.results[0]?.status).toBe('rejected');
        expect(res.results[0]?.reason).toMatch(/names device "dev-someone-else"/);
      });

      it('rejects an unknown characteristic', async () => {
        const res = await push([makeSample(device.deviceId, { characteristicId: 'ch-nope' })]);
        expect(res.results[0]).toMatchObject({ status: 'rejected', reason: expect.stringMatching(/ch-nope/) });
      });

      it('rejects an unknown or inactive person', async () => {
        const res = await push([makeSample(device.deviceId, { recordedBy: 'p-nobody' }), makeSample(device.deviceId, { recordedBy: 'p-gone' })]);
        expect(res.results.map((r) => r.status)).toEqual(['rejected', 'rejected']);
        expect(res.results[1]?.reason).toMatch(/not an active person/);
      });

      it('rejects an acknowledgement by an operator and accepts one by a supervisor', async () => {
        const ack = (by: string): DeviceRecord => ({
          kind: 'ack', id: testUuid(), responseId: testUuid(), characteristicId: 'ch-len', by, at: T0.toISOString(), deviceId: device.deviceId,
        });
        const res = await push([ack('p-op'), ack('p-sup')]);
        expect(res.results.map((r) => r.status)).toEqual(['rejected', 'stored']);
        expect(res.results[0]?.reason).toMatch(/supervisor/);
      });

      it('rejects a count sample on a measured characteristic and a p sample without the quantity inspected', async () => {
        const res = await push([
          makeSample(device.deviceId, { values: undefined, count: 3 }),
          makeSample(device.deviceId, { characteristicId: 'ch-def', values: undefined, count: 3 }),
          makeSample(device.deviceId, { characteristicId: 'ch-def', values: undefined, count: 3, inspected: 96 }),
        ]);
        expect(res.results.map((r) => r.status)).toEqual(['rejected', 'rejected', 'stored']);
      });

      it('rejects a p sample with more nonconforming items than items inspected', async () => {
        const res = await push([makeSample(device.deviceId, { characteristicId: 'ch-def', values: undefined, count: 97, inspected: 96 })]);
        expect(res.results[0]).toMatchObject({ status: 'rejected' });
        expect(res.results[0]!.reason).toMatch(/cannot exceed the quantity inspected/);
      });
    });

    it('answers 400 for a batch that is not a batch, and 401 without a device token', async () => {
      const bad = await api(server, 'POST', '/api/v1/sync/push', { device: device.deviceToken, body: { batchId: 'x', records: [] } });
      expect(bad.statusCode).toBe(400);
      expect(bad.json().error).toBe('bad-request');
      const anon = await api(server, 'POST', '/api/v1/sync/push', { body: { batchId: testUuid(), records: [makeSample(device.deviceId)] } });
      expect(anon.statusCode).toBe(401);
    });
  });
});

import fc from 'fast-check';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DeviceRecord, PushResponse, z } from '../../src/schema/index';
import { api, enrolDevice, makeSample, startTestServer, testUuid, type TestServer } from './fixtures';
import { describeBackends } from './backends';

describeBackends('push fuzz', (backend) => {
  let server: TestServer;
  let device: { deviceId: string; deviceToken: string };
  beforeAll(async () => {
    server = await startTestServer({ backend });
    device = await enrolDevice(server);
  });
  afterAll(async () => server.close());

  const countRecords = async () => Number((await server.sql<{ n: number | string }>(`SELECT COUNT(*) AS n FROM log WHERE entry_kind = 'record'`))[0]?.n);

  describe('push with hostile input (sync.md §2.11)', () => {
    it('never answers 5xx and never stores a record that fails the schema', async () => {
      const before = await countRecords();
      // Arbitrary JSON, valid samples with one field replaced by arbitrary JSON, and valid samples.
      const mutated = fc
        .tuple(fc.constantFrom('kind', 'id', 'characteristicId', 'takenAt', 'recordedBy', 'values', 'count', 'inspected', 'supersedes'), fc.jsonValue())
        .map(([key, value]) => ({ ...makeSample(device.deviceId), [key]: value }));
      await fc.assert(
        fc.asyncProperty(fc.array(fc.oneof(fc.jsonValue(), mutated, fc.constant(null).map(() => makeSample(device.deviceId))), { minLength: 1, maxLength: 5 }), async (records) => {
          const res = await api(server, 'POST', '/api/v1/sync/push', { device: device.deviceToken, body: { batchId: testUuid(), records } });
          expect(res.statusCode).toBeLessThan(500);
          if (res.statusCode === 200) {
            const body = z.parse(PushResponse, res.json());
            expect(body.results).toHaveLength(records.length);
          }
        }),
        { numRuns: 150, seed: 20261202 },
      );
      // Whatever was stored passed the schema on the way in and reads back through it.
      const stored = await server.sql<{ body: string }>(`SELECT body FROM log WHERE entry_kind = 'record'`);
      expect(stored.length).toBeGreaterThan(before);
      for (const row of stored) expect(z.safeParse(DeviceRecord, JSON.parse(row.body)).success).toBe(true);
    });

    it('answers arbitrary bodies with 4xx, never 5xx', async () => {
      await fc.assert(
        fc.asyncProperty(fc.oneof(fc.jsonValue().map((v) => JSON.stringify(v)), fc.string()), async (payload) => {
          const res = await api(server, 'POST', '/api/v1/sync/push', { device: device.deviceToken, body: payload, headers: { 'content-type': 'application/json' } });
          expect(res.statusCode).toBeGreaterThanOrEqual(400);
          expect(res.statusCode).toBeLessThan(500);
        }),
        { numRuns: 100, seed: 7 },
      );
    });
  });
});

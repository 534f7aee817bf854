import type { AddressInfo } from 'node:net';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { PushResponse, z } from '../../src/schema/index';
import { enrolDevice, makeSample, PROTOCOL, startTestServer, testUuid, type TestServer } from './fixtures';
import { describeBackends } from './backends';

describeBackends('listening server', (backend) => {
  let server: TestServer;
  let base: string;
  beforeEach(async () => {
    server = await startTestServer({ backend });
    await server.app.listen({ host: '127.0.0.1', port: 0 });
    base = `http://127.0.0.1:${(server.app.server.address() as AddressInfo).port}`;
  });
  afterEach(async () => server.close());

  describe('over a real socket', () => {
    it('pushes with fetch and answers only after the commit, with a Date header for clock offset', async () => {
      const { deviceId, deviceToken } = await enrolDevice(server);
      const sample = makeSample(deviceId);
      const res = await fetch(`${base}/api/v1/sync/push`, {
        method: 'POST',
        headers: { ...PROTOCOL, 'content-type': 'application/json', authorization: `Bearer ${deviceToken}` },
        body: JSON.stringify({ batchId: testUuid(), records: [sample] }),
      });
      expect(res.status).toBe(200);
      expect(res.headers.get('date')).toBeTruthy();
      const body = z.parse(PushResponse, await res.json());
      expect(body.results).toEqual([{ id: sample.id, status: 'stored', serverSeq: expect.any(Number) }]);
      const [row] = await server.sql<{ server_seq: number | string }>('SELECT server_seq FROM device_records WHERE id = ?', sample.id);
      expect(Number(row?.server_seq)).toBe(body.results[0]?.serverSeq);
    });
  });
});

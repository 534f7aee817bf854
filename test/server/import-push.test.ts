import { afterEach, beforeEach, expect, it } from 'vitest';
import { PushResponse, z } from '../../src/schema/index';
import { describeBackends } from './backends';
import { api, enrolDevice, makeSample, startTestServer, testUuid, type TestServer } from './fixtures';

describeBackends('push of imported history', (backend) => {
  let server: TestServer;
  let device: { deviceId: string; deviceToken: string };
  beforeEach(async () => {
    server = await startTestServer({ backend });
    device = await enrolDevice(server);
  });
  afterEach(async () => server.close());

  async function push(records: unknown[]): Promise<PushResponse> {
    const res = await api(server, 'POST', '/api/v1/sync/push', { device: device.deviceToken, body: { batchId: testUuid(), records } });
    expect(res.statusCode).toBe(200);
    return z.parse(PushResponse, res.json());
  }

  it('stores a sample marked as imported by an admin once, with its source note', async () => {
    const s = makeSample(device.deviceId, { recordedBy: 'p-adm', imported: { file: 'check-sheet-week-48.csv', line: 7 } });
    expect((await push([s])).results[0]?.status).toBe('stored');
    expect((await push([s])).results[0]?.status).toBe('duplicate');
    const rows = await server.sql<{ body: string }>(`SELECT body FROM log WHERE entity_id = ?`, s.id);
    expect(rows).toHaveLength(1);
    expect(JSON.parse(rows[0]!.body).imported).toEqual({ file: 'check-sheet-week-48.csv', line: 7 });
  });

  it('refuses imported history from an operator, with the reason', async () => {
    const s = makeSample(device.deviceId, { imported: { file: 'sheet.csv', line: 2 } });
    const [result] = (await push([s])).results;
    expect(result?.status).toBe('rejected');
    expect(result?.reason).toMatch(/import history/);
  });
});

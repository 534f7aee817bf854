/**
 * Device sequence numbers (sync.md §3.2 and S9): a tablet numbers every record it makes from 1;
 * the server notes each number it receives — whatever became of the record — and the admin's
 * tablet list shows the numbers below the highest that never arrived (still waiting on the
 * tablet, or lost with a wiped tablet). Runs on SQLite and PostgreSQL.
 */
import { afterEach, beforeEach, expect, it } from 'vitest';
import { describeBackends } from './backends';
import { api, enrolDevice, makeSample, signIn, startTestServer, testUuid, type TestServer } from './fixtures';

describeBackends('device sequence numbers', (backend) => {
  let server: TestServer;
  let tablet: { deviceId: string; deviceToken: string };
  let admin: string;
  beforeEach(async () => {
    server = await startTestServer({ backend });
    tablet = await enrolDevice(server, 'Line tablet');
    const office = await enrolDevice(server, 'Office tablet');
    admin = await signIn(server, office.deviceToken, 'ada', '3456');
  });
  afterEach(async () => server.close());

  const push = (records: unknown[], deviceSeqs?: number[]) =>
    api(server, 'POST', '/api/v1/sync/push', { device: tablet.deviceToken, body: { batchId: testUuid(), records, ...(deviceSeqs ? { deviceSeqs } : {}) } });
  const lineTablet = async () => {
    const res = await api(server, 'GET', '/api/v1/admin/devices', { session: admin });
    expect(res.statusCode).toBe(200);
    return (res.json().devices as { id: string; records?: unknown }[]).find((d) => d.id === tablet.deviceId)!;
  };

  it('lists the numbers never received below the highest, as ranges, and a resend fills them', async () => {
    const samples = Array.from({ length: 9 }, () => makeSample(tablet.deviceId));
    // numbers 1, 2, 5, 6, 9 arrive; 3–4 and 7–8 do not
    expect((await push([samples[0], samples[1], samples[4]], [1, 2, 5])).statusCode).toBe(200);
    expect((await push([samples[5], samples[8]], [6, 9])).statusCode).toBe(200);
    expect((await lineTablet()).records).toEqual({ received: 5, highest: 9, missing: 4, gaps: [{ from: 3, to: 4 }, { from: 7, to: 8 }] });
    // the tablet sends 3, 4 and 7 later, and 5 again (a duplicate changes nothing)
    expect((await push([samples[2], samples[3], samples[6], samples[4]], [3, 4, 7, 5])).statusCode).toBe(200);
    expect((await lineTablet()).records).toEqual({ received: 8, highest: 9, missing: 1, gaps: [{ from: 8, to: 8 }] });
  });

  it('counts a refused record as received (it reached the server; the tablet shows why it was refused)', async () => {
    const bad = { ...makeSample(tablet.deviceId), characteristicId: 'no-such-characteristic' };
    const res = await push([makeSample(tablet.deviceId), bad], [1, 2]);
    expect(res.json().results.map((r: { status: string }) => r.status)).toEqual(['stored', 'rejected']);
    expect((await lineTablet()).records).toEqual({ received: 2, highest: 2, missing: 0, gaps: [] });
  });

  it('refuses a batch whose numbers do not match its records, and lists nothing for a tablet that never sent numbers', async () => {
    const res = await push([makeSample(tablet.deviceId), makeSample(tablet.deviceId)], [1]);
    expect(res.statusCode).toBe(400);
    expect(res.json().message).toMatch(/2 records but 1 device sequence/);
    expect((await push([makeSample(tablet.deviceId)])).statusCode).toBe(200); // an older tablet: no numbers
    expect((await lineTablet()).records).toBeUndefined();
  });
});

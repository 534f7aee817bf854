/** Phases sent through POST /api/v1/setup keep the optional baselineCount on both stores, and come down in the pull. */
import { afterEach, beforeEach, expect, it } from 'vitest';
import { describeBackends } from './backends';
import { api, enrolDevice, signIn, startTestServer, T0, type TestServer } from './fixtures';

describeBackends('phases in the set-up route', (backend) => {
  let server: TestServer;
  let device: { deviceId: string; deviceToken: string };
  beforeEach(async () => {
    server = await startTestServer({ backend });
    device = await enrolDevice(server);
  });
  afterEach(async () => server.close());

  const phase = (number: number, extra: object = {}) => ({
    kind: 'phase', id: `ch-len:phase-${number}`,
    body: { id: `ch-len:phase-${number}`, characteristicId: 'ch-len', number, startsAt: new Date(T0.getTime() + number * 3_600_000).toISOString(), reason: `Change ${number}`, ...extra },
  });

  it('stores a phase with baselineCount and one without, and both reach a tablet through the pull', async () => {
    const session = await signIn(server, device.deviceToken, 'ada', '3456');
    const res = await api(server, 'POST', '/api/v1/setup', { session, body: { entries: [phase(1), phase(2, { baselineCount: 8 }), phase(3, { given: { centre: 10, sigma: 0.1 } })] } });
    expect(res.statusCode).toBe(200);
    expect((await server.store.getSetup('phase', 'ch-len:phase-2'))?.body).toMatchObject({ number: 2, baselineCount: 8 });
    expect((await server.store.getSetup('phase', 'ch-len:phase-1'))?.body).not.toHaveProperty('baselineCount');
    const pulled = await api(server, 'GET', '/api/v1/sync/pull?after=0&limit=500', { device: device.deviceToken });
    const bodies = pulled.json().entries.filter((e: { entry: { kind: string } }) => e.entry.kind === 'phase').map((e: { entry: { body: unknown } }) => e.entry.body);
    expect(bodies).toContainEqual(expect.objectContaining({ id: 'ch-len:phase-2', baselineCount: 8 }));
    expect(bodies).toContainEqual(expect.objectContaining({ id: 'ch-len:phase-3', given: { centre: 10, sigma: 0.1 } }));
  });

  it('refuses a baselineCount below 2 with a clear 400, and an operator with 403', async () => {
    const admin = await signIn(server, device.deviceToken, 'ada', '3456');
    const bad = await api(server, 'POST', '/api/v1/setup', { session: admin, body: { entries: [phase(2, { baselineCount: 1 })] } });
    expect(bad.statusCode).toBe(400);
    expect(bad.json().message).toMatch(/baselineCount/);
    const operator = await signIn(server, device.deviceToken, 'odile', '1234');
    expect((await api(server, 'POST', '/api/v1/setup', { session: operator, body: { entries: [phase(2)] } })).statusCode).toBe(403);
  });
});

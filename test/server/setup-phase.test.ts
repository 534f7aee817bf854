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

  it('takes a corrected and then a withdrawn version of a phase (same id) from an admin, keeps the notes, and sends the latest in the pull; a supervisor is refused', async () => {
    const admin = await signIn(server, device.deviceToken, 'ada', '3456');
    expect((await api(server, 'POST', '/api/v1/setup', { session: admin, body: { entries: [phase(1), phase(2, { baselineCount: 8 })] } })).statusCode).toBe(200);
    const was = { startsAt: phase(2).body.startsAt, reason: 'Change 2', baselineCount: 8 };
    const corrections = [{ at: '2026-12-02T10:00:00.000Z', by: 'p-adm', note: 'Typo in the reason', was }];
    const corrected = phase(2, { baselineCount: 8, reason: 'Change 2, corrected', corrections });
    expect((await api(server, 'POST', '/api/v1/setup', { session: admin, body: { entries: [corrected] } })).statusCode).toBe(200);
    expect((await server.store.getSetup('phase', 'ch-len:phase-2'))?.body).toMatchObject({ reason: 'Change 2, corrected', corrections });

    const supervisor = await signIn(server, device.deviceToken, 'sven', '2345');
    const withdrawn = { at: '2026-12-02T11:00:00.000Z', by: 'p-adm', note: 'Started by mistake' };
    const refused = await api(server, 'POST', '/api/v1/setup', { session: supervisor, body: { entries: [phase(2, { withdrawn })] } });
    expect(refused.statusCode).toBe(403);
    expect((await server.store.getSetup('phase', 'ch-len:phase-2'))?.body).not.toHaveProperty('withdrawn');

    const res = await api(server, 'POST', '/api/v1/setup', { session: admin, body: { entries: [{ ...corrected, body: { ...corrected.body, withdrawn } }] } });
    expect(res.statusCode).toBe(200);
    const pulled = await api(server, 'GET', '/api/v1/sync/pull?after=0&limit=500', { device: device.deviceToken });
    const versions = pulled.json().entries.filter((e: { entry: { kind: string; id: string } }) => e.entry.kind === 'phase' && e.entry.id === 'ch-len:phase-2')
      .map((e: { entry: { body: unknown } }) => e.entry.body);
    expect(versions[versions.length - 1]).toMatchObject({ reason: 'Change 2, corrected', corrections, withdrawn });
  });

  it('refuses a withdrawal without a note with a clear 400', async () => {
    const admin = await signIn(server, device.deviceToken, 'ada', '3456');
    const bad = await api(server, 'POST', '/api/v1/setup', { session: admin, body: { entries: [phase(2, { withdrawn: { at: '2026-12-02T11:00:00.000Z', by: 'p-adm', note: ' ' } })] } });
    expect(bad.statusCode).toBe(400);
    expect(bad.json().message).toMatch(/withdrawn/);
  });

  it('keeps the trail: a rewrite without a correction, a dropped correction or a change to a withdrawn phase is refused with 409; the same version again is fine', async () => {
    const admin = await signIn(server, device.deviceToken, 'ada', '3456');
    const post = async (entry: object) => api(server, 'POST', '/api/v1/setup', { session: admin, body: { entries: [entry] } });
    expect((await post(phase(2))).statusCode).toBe(200);
    expect((await post(phase(2))).statusCode).toBe(200); // a retry of the same version
    // Another tablet's phase 2, started at the same time: not silently written over.
    const rival = await post(phase(2, { reason: 'Another change' }));
    expect(rival.statusCode).toBe(409);
    expect(rival.json()).toMatchObject({ error: 'phase-trail', message: expect.stringMatching(/already exists with other content/) });
    const was = { startsAt: phase(2).body.startsAt, reason: 'Change 2' };
    const corrections = [{ at: '2026-12-02T10:00:00.000Z', by: 'p-adm', note: 'Typo', was }];
    expect((await post(phase(2, { reason: 'Change two', corrections }))).statusCode).toBe(200);
    const dropped = await post(phase(2, { reason: 'Change 2' }));
    expect(dropped.statusCode).toBe(409);
    expect(dropped.json().message).toMatch(/cannot be removed or rewritten/);
    const withdrawn = { at: '2026-12-02T11:00:00.000Z', by: 'p-adm', note: 'Mistake' };
    expect((await post(phase(2, { reason: 'Change two', corrections, withdrawn }))).statusCode).toBe(200);
    const undone = await post(phase(2, { reason: 'Change two', corrections }));
    expect(undone.statusCode).toBe(409);
    expect(undone.json().message).toMatch(/withdrawn and stays as it was/);
    expect((await server.store.getSetup('phase', 'ch-len:phase-2'))?.body).toMatchObject({ reason: 'Change two', withdrawn });
  });
});

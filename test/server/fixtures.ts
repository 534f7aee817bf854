import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { FastifyInstance, InjectOptions, LightMyRequestResponse } from 'fastify';
import { PROTOCOL_HEADER, PROTOCOL_VERSION, type Characteristic, type DeviceRecord, type Person, type SetupRecord } from '../../src/schema/index';
import { createServer, type RateLimits } from '../../src/server/create-server';
import { hashPin, newOfflineVerifier } from '../../src/server/pin-hash';
import { issueEnrolmentCode } from '../../src/server/routes/admin-enrolment-codes';
import type { PersonSecrets, ServerStore } from '../../src/server/store/server-store';
import { openTestStore, type Backend, type SqlRunner } from './backends';

export const SITE = 'site-t';
export const T0 = new Date('2026-11-30T08:00:00.000Z');

export const PEOPLE: readonly (Person & { pin: string })[] = [
  { id: 'p-op', name: 'Odile Test', login: 'odile', role: 'operator', active: true, pin: '1234' },
  { id: 'p-sup', name: 'Sven Test', login: 'sven', role: 'supervisor', active: true, pin: '2345' },
  { id: 'p-adm', name: 'Ada Test', login: 'ada', role: 'admin', active: true, pin: '3456' },
  { id: 'p-gone', name: 'Gone Test', login: 'gone', role: 'operator', active: false, pin: '4567' },
];

const baseCharacteristic = {
  stationId: 'st-1',
  decimals: 2,
  intervalMinutes: 60,
  spec: { lsl: 9, usl: 11 },
  rules: ['we1' as const],
  reactionPlan: ['Stop and call the setter.'],
  causeCategories: [],
  safetyCritical: false,
  baselineSize: 20,
};
export const CHARACTERISTICS: readonly Characteristic[] = [
  { ...baseCharacteristic, id: 'ch-len', name: 'Length', unit: 'mm', chartType: 'xmr', subgroupSize: 1 },
  { ...baseCharacteristic, id: 'ch-def', name: 'Defectives', unit: 'defectives', chartType: 'p', subgroupSize: 100, decimals: 0 },
];

export function setupEntries(): SetupRecord[] {
  return [
    { kind: 'site', id: SITE, body: { id: SITE, name: 'Test site' } },
    { kind: 'line', id: 'ln-1', body: { id: 'ln-1', siteId: SITE, name: 'Line 1' } },
    { kind: 'station', id: 'st-1', body: { id: 'st-1', lineId: 'ln-1', name: 'Station 1' } },
    ...CHARACTERISTICS.map((c): SetupRecord => ({ kind: 'characteristic', id: c.id, body: c })),
    ...PEOPLE.map(({ pin: _pin, ...p }): SetupRecord => ({ kind: 'person', id: p.id, body: p })),
    { kind: 'causes', id: `${SITE}-causes`, body: { siteId: SITE, categories: ['Machine', 'Method'] } },
  ];
}

let secretsOnce: Promise<Omit<PersonSecrets, 'updatedAt'>[]> | undefined;
/** PIN hashes are slow on purpose; compute them once per test file. */
function peopleSecrets(): Promise<Omit<PersonSecrets, 'updatedAt'>[]> {
  secretsOnce ??= Promise.all(
    PEOPLE.map(async (p) => {
      const pin = await hashPin(p.pin);
      // Few iterations: the derivation is the same, the test is faster.
      const v = await newOfflineVerifier(p.pin, 1000);
      return { personId: p.id, pinHash: pin.hash, pinSalt: pin.salt, verifierSalt: v.salt, verifierHash: v.hash, verifierIterations: v.iterations };
    }),
  );
  return secretsOnce;
}

export interface TestServer {
  readonly app: FastifyInstance;
  readonly store: ServerStore;
  readonly backend: Backend;
  /** Raw SQL on the server's database (`?` placeholders; PostgreSQL returns BIGINT and COUNT as strings). */
  readonly sql: SqlRunner;
  readonly dir: string;
  /** Moves the test clock. */
  advance(ms: number): void;
  now(): Date;
  close(): Promise<void>;
}

/**
 * A server on a fresh store (a temporary SQLite file by default, or a fresh PostgreSQL schema with
 * `backend: 'postgres'`) with a small site, people with PINs and a fixed clock.
 */
export async function startTestServer(opts: { backend?: Backend; distDir?: string; rateLimits?: Partial<RateLimits> } = {}): Promise<TestServer> {
  const dir = mkdtempSync(join(tmpdir(), 'plumbline-server-'));
  const { store, sql, dispose, backend } = await openTestStore(opts.backend ?? 'sqlite');
  let t = T0.getTime();
  const now = () => new Date(t);
  await store.appendSetup(setupEntries().map((record) => ({ siteId: SITE, record })), now().toISOString());
  for (const secrets of await peopleSecrets()) await store.setPersonSecrets({ ...secrets, updatedAt: now().toISOString() });
  const app = createServer({ store, distDir: opts.distDir ?? join(dir, 'no-dist'), now, rateLimits: opts.rateLimits });
  await app.ready();
  return {
    app,
    store,
    backend,
    sql,
    dir,
    advance: (ms) => {
      t += ms;
    },
    now,
    close: async () => {
      await app.close();
      await dispose();
      rmSync(dir, { recursive: true, force: true });
    },
  };
}

export const PROTOCOL = { [PROTOCOL_HEADER]: String(PROTOCOL_VERSION) };

/** An API call with the protocol header (and a device token / session token when given). */
export function api(
  server: TestServer,
  method: 'GET' | 'POST',
  url: string,
  opts: { body?: unknown; device?: string; session?: string; headers?: Record<string, string>; ip?: string } = {},
): Promise<LightMyRequestResponse> {
  const headers: Record<string, string> = { ...PROTOCOL, ...opts.headers };
  if (opts.device) headers.authorization = `Bearer ${opts.device}`;
  if (opts.session) headers['x-plumbline-session'] = opts.session;
  const req: InjectOptions = { method, url, headers, remoteAddress: opts.ip ?? '10.0.0.1' };
  if (opts.body !== undefined) req.payload = opts.body as InjectOptions['payload'];
  return server.app.inject(req);
}

/** Issues a code and enrols a tablet; returns its id and token. */
export async function enrolDevice(server: TestServer, name = 'Tablet 1'): Promise<{ deviceId: string; deviceToken: string }> {
  const { code } = await issueEnrolmentCode(server.store, SITE, 'p-adm', server.now());
  const res = await api(server, 'POST', '/api/v1/enrol', { body: { code, deviceName: name } });
  if (res.statusCode !== 200) throw new Error(`enrol failed: ${res.statusCode} ${res.body}`);
  return res.json() as { deviceId: string; deviceToken: string };
}

/** Signs a person in on a device; returns the session token. */
export async function signIn(server: TestServer, deviceToken: string, login: string, pin: string): Promise<string> {
  const res = await api(server, 'POST', '/api/v1/sign-in', { device: deviceToken, body: { login, pin } });
  if (res.statusCode !== 200) throw new Error(`sign-in failed: ${res.statusCode} ${res.body}`);
  return (res.json() as { sessionToken: string }).sessionToken;
}

let uuidCounter = 0;
/** A valid UUIDv7-shaped id, unique within the test run. */
export function testUuid(): string {
  uuidCounter += 1;
  const tail = uuidCounter.toString(16).padStart(12, '0');
  return `0190f1c2-0000-7000-8000-${tail}`;
}

export function makeSample(deviceId: string, overrides: Partial<Extract<DeviceRecord, { kind: 'sample' }>> = {}): Extract<DeviceRecord, { kind: 'sample' }> {
  return {
    kind: 'sample',
    id: testUuid(),
    characteristicId: 'ch-len',
    takenAt: T0.toISOString(),
    recordedBy: 'p-op',
    deviceId,
    values: [10.01],
    ...overrides,
  };
}

import { DeviceRecord, z } from '../../schema/index';
import { contentHash } from '../canonical-json';
import { recordActor } from '../check-record';
import { personSecrets } from '../routes/admin-pin';
import type { ServerStore } from '../store/server-store';
import { hashSecret, newToken } from '../tokens';
import { buildDemoHistory, type DemoHistory } from './demo-history';
import { DEMO_DEVICE_ID, DEMO_PEOPLE, DEMO_SITE_ID, demoSetupRecords } from './demo-site';

/** True when the store already holds the demo site. */
export async function hasDemo(store: ServerStore): Promise<boolean> {
  return (await store.getSetup('site', DEMO_SITE_ID)) !== undefined;
}

/**
 * Writes the demo into an empty store: set-up, people's PINs, the device the history was
 * recorded on (with a token nobody holds) and about three weeks of records ending before `now`.
 */
export async function seedDemo(store: ServerStore, now: Date): Promise<DemoHistory> {
  const history = buildDemoHistory(now);
  const at = now.toISOString();
  await store.appendSetup(demoSetupRecords(history.historyStart).map((record) => ({ siteId: DEMO_SITE_ID, record })), at);
  for (const person of DEMO_PEOPLE) await store.setPersonSecrets(await personSecrets(person.id, person.pin, now));
  await store.createDevice({ id: DEMO_DEVICE_ID, siteId: DEMO_SITE_ID, name: 'Demo history', tokenHash: hashSecret(newToken()), enrolledAt: history.historyStart.toISOString() });

  const items = history.records.map((raw) => {
    const record = z.parse(DeviceRecord, raw); // the demo must pass the same schema as a tablet's push
    return { record, siteId: DEMO_SITE_ID, contentHash: contentHash(record), deviceId: DEMO_DEVICE_ID, ...recordActor(record) };
  });
  const outcomes = await store.insertRecords(items, at);
  const notStored = outcomes.filter((o) => o.status !== 'stored');
  if (notStored.length > 0) throw new Error(`demo seed: ${notStored.length} records were not stored (first: ${notStored[0]?.id} ${notStored[0]?.status})`);
  return history;
}

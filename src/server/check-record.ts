import { DeviceRecord, describeIssues, isVariableChart, type Characteristic, type Person, type Role, z } from '../schema/index';
import { hasRoleAtLeast, roleWithArticle } from './auth';
import type { DeviceRow, ServerStore } from './store/server-store';

export type RecordCheck =
  | { readonly ok: true; readonly record: DeviceRecord; readonly personId: string; readonly clientTime: string }
  | { readonly ok: false; readonly id: string; readonly reason: string };

/** Looks set-up up once per push, not once per record. */
export class SetupLookup {
  private readonly characteristics = new Map<string, Promise<{ siteId: string; body: Characteristic } | undefined>>();
  private readonly people = new Map<string, Promise<{ siteId: string; body: Person } | undefined>>();

  constructor(private readonly store: ServerStore) {}

  characteristic(id: string): Promise<{ siteId: string; body: Characteristic } | undefined> {
    let hit = this.characteristics.get(id);
    if (!hit) this.characteristics.set(id, (hit = this.store.getSetup('characteristic', id)));
    return hit;
  }

  person(id: string): Promise<{ siteId: string; body: Person } | undefined> {
    let hit = this.people.get(id);
    if (!hit) this.people.set(id, (hit = this.store.getSetup('person', id)));
    return hit;
  }
}

/**
 * Validates one pushed record on its own (schema, device, references, roles), so one bad record
 * never blocks the others. The reason of a rejection is a sentence for the operator and supervisor.
 */
export async function checkRecord(raw: unknown, index: number, device: DeviceRow, lookup: SetupLookup): Promise<RecordCheck> {
  const id = idOf(raw, index);
  const parsed = z.safeParse(DeviceRecord, raw);
  if (!parsed.success) return { ok: false, id, reason: `The record does not match the schema:\n${describeIssues(parsed.error)}` };
  const record = parsed.data;
  if (record.deviceId !== device.id) {
    return { ok: false, id, reason: `The record names device "${record.deviceId}" but was sent by device "${device.id}".` };
  }

  const characteristic = await lookup.characteristic(record.characteristicId);
  if (!characteristic || characteristic.siteId !== device.siteId) {
    return { ok: false, id, reason: `Characteristic "${record.characteristicId}" does not exist at this site.` };
  }

  const { personId, clientTime, minimumRole, action } = actorOf(record);
  const person = await lookup.person(personId);
  if (!person || person.siteId !== device.siteId || !person.body.active) {
    return { ok: false, id, reason: `Person "${personId}" is not an active person of this site.` };
  }
  if (!hasRoleAtLeast(person.body.role, minimumRole)) {
    return { ok: false, id, reason: `Only ${roleWithArticle(minimumRole)} or above may ${action}; ${person.body.name} is ${roleWithArticle(person.body.role)}.` };
  }

  if (record.kind === 'sample') {
    const problem = sampleProblem(record, characteristic.body);
    if (problem) return { ok: false, id, reason: problem };
  }
  return { ok: true, record, personId, clientTime };
}

function idOf(raw: unknown, index: number): string {
  const id = raw !== null && typeof raw === 'object' ? (raw as { id?: unknown }).id : undefined;
  return typeof id === 'string' && id.length > 0 && id.length <= 64 ? id : `#${index}`;
}

/** The person a record names and the device clock time it carries (for the audit columns). */
export function recordActor(record: DeviceRecord): { personId: string; clientTime: string } {
  const { personId, clientTime } = actorOf(record);
  return { personId, clientTime };
}

function actorOf(record: DeviceRecord): { personId: string; clientTime: string; minimumRole: Role; action: string } {
  switch (record.kind) {
    case 'sample':
      if (record.excluded) return { personId: record.recordedBy, clientTime: record.takenAt, minimumRole: 'engineer', action: 'exclude a sample from the limits' };
      if (record.imported) return { personId: record.recordedBy, clientTime: record.takenAt, minimumRole: 'engineer', action: 'import history' };
      return { personId: record.recordedBy, clientTime: record.takenAt, minimumRole: 'operator', action: 'record a sample' };
    case 'response':
      return { personId: record.respondedBy, clientTime: record.respondedAt, minimumRole: 'operator', action: 'answer a signal' };
    case 'ack':
      return { personId: record.by, clientTime: record.at, minimumRole: 'supervisor', action: 'acknowledge a response' };
  }
}

/** A sample must carry what its chart plots: values for variable charts, a count for attribute charts. */
function sampleProblem(sample: Extract<DeviceRecord, { kind: 'sample' }>, c: Characteristic): string | undefined {
  if (isVariableChart(c.chartType)) {
    if (!sample.values) return `Characteristic "${c.id}" is measured (${c.chartType}); the sample needs values.`;
  } else {
    if (sample.count === undefined) return `Characteristic "${c.id}" is counted (${c.chartType}); the sample needs a count.`;
    if ((c.chartType === 'p' || c.chartType === 'np' || c.chartType === 'u') && sample.inspected === undefined) {
      return `Characteristic "${c.id}" (${c.chartType}) needs the quantity inspected with each count.`;
    }
    if ((c.chartType === 'p' || c.chartType === 'np') && sample.inspected !== undefined && sample.count > sample.inspected) {
      return `The sample counts ${sample.count} nonconforming items out of ${sample.inspected} inspected: the count cannot exceed the quantity inspected.`;
    }
  }
  if ((sample.supersedes !== undefined || sample.excluded) && !sample.reason?.trim()) {
    return 'A correction or an exclusion needs a reason.';
  }
  return undefined;
}

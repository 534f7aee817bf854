import { describe, expect, it } from 'vitest';
import { checkImportRows, samplesToImport } from '../../src/app/import-check';
import { guessMapping, mapRows } from '../../src/app/import-mapping';
import { readCsvTable } from '../../src/app/import-table';
import type { Sample } from '../../src/schema';
import { getOutboxRow, getSamplesForCharacteristic } from '../../src/store';
import { SITE } from '../server/fixtures';
import { HOUR, signedIn, useServerPerTest, type Tablet } from './tablet-harness';

const server = useServerPerTest();

/** The rows of `text` checked for ch-len on this tablet, as the import screen does it. */
function samplesFrom(t: Tablet, text: string): Sample[] {
  const s = t.app.getState();
  const ch = s.setup.characteristics.find((c) => c.id === 'ch-len')!;
  const table = readCsvTable(text);
  const rows = mapRows(table, guessMapping(table, ch).mapping);
  return samplesToImport(checkImportRows(rows, {
    characteristic: ch, existing: s.views['ch-len']?.series.samples ?? [], decimal: '.', dateOrder: 'dmy', now: t.clock.t,
    recordedBy: s.person!.id, deviceId: s.device!.deviceId, fileName: 'lengths.csv',
  }), false);
}

async function copiesOnServer(): Promise<Map<string, number>> {
  const counts = new Map<string, number>();
  for (const r of await server().store.readLog(SITE, 0, 10_000)) {
    if (r.entry.kind === 'record' && r.entry.body.kind === 'sample') counts.set(r.entry.id, (counts.get(r.entry.id) ?? 0) + 1);
  }
  return counts;
}

function fileOf(t: Tablet, n: number): string {
  const lines = ['taken_at,value,comment'];
  for (let i = 0; i < n; i++) lines.push(`${new Date(t.clock.t - (n - i) * HOUR).toISOString()},${(10 + (i % 5) / 100).toFixed(2)},row ${i}`);
  return lines.join('\r\n');
}

describe('importSamples()', () => {
  it('records the samples with outbox rows, sends them, and a second import of the same file adds nothing anywhere', async () => {
    const t = await signedIn('ada', '3456');
    t.app.actions.open({ name: 'import', characteristicId: 'ch-len' });
    await t.settle();
    const text = fileOf(t, 1200); // more than two batches
    const samples = samplesFrom(t, text);
    expect(samples).toHaveLength(1200);
    const progress: number[] = [];
    expect(await t.app.actions.importSamples('ch-len', samples, (done) => progress.push(done))).toEqual({ saved: 1200, alreadyHeld: 0 });
    expect(progress).toEqual([500, 1000, 1200]);
    expect(t.app.getState().views['ch-len']!.series.sampleIds).toHaveLength(1200);
    expect((await getOutboxRow(t.db, samples[0]!.id))?.kind).toBe('sample');
    await t.settle();
    expect((await getOutboxRow(t.db, samples[1199]!.id))?.state).toBe('acked');
    const onServer = await copiesOnServer();
    for (const s of samples) expect(onServer.get(s.id)).toBe(1);

    // The same file again: the check finds every row on the chart; even forced through, nothing is added.
    expect(samplesFrom(t, text)).toEqual([]);
    expect(await t.app.actions.importSamples('ch-len', samples)).toEqual({ saved: 0, alreadyHeld: 1200 });
    await t.settle();
    expect(await getSamplesForCharacteristic(t.db, 'ch-len')).toHaveLength(1200);
    expect([...(await copiesOnServer()).values()].filter((n) => n > 1)).toEqual([]);
    expect((await copiesOnServer()).size).toBe(1200);
  });

  it('a correction of an imported sample is not marked as imported; leaving it out of the limits keeps the mark', async () => {
    const t = await signedIn('ada', '3456');
    t.app.actions.open({ name: 'import', characteristicId: 'ch-len' });
    await t.settle();
    const [a, b] = samplesFrom(t, fileOf(t, 2));
    await t.app.actions.importSamples('ch-len', [a!, b!]);
    expect(await t.app.actions.correct('ch-len', a!.id, { values: [10.2] }, 'Misread the sheet')).toBe(true);
    expect(await t.app.actions.setExcluded('ch-len', b!.id, true, 'Gauge out of calibration that day')).toBe(true);
    const all = await getSamplesForCharacteristic(t.db, 'ch-len');
    expect(all.find((s) => s.supersedes === a!.id)!.imported).toBeUndefined();
    expect(all.find((s) => s.supersedes === b!.id)!.imported).toEqual(b!.imported);
  });

  it('is refused to an operator, with the reason', async () => {
    const admin = await signedIn('ada', '3456');
    const samples = samplesFrom(admin, fileOf(admin, 3));
    const t = await signedIn('odile', '1234');
    expect(await t.app.actions.importSamples('ch-len', samples)).toBeNull();
    expect(t.app.getState().error).toBe('Only a quality engineer (or admin) can import history.');
    expect(await getSamplesForCharacteristic(t.db, 'ch-len')).toEqual([]);
  });

  it('refuses samples of another characteristic', async () => {
    const t = await signedIn('ada', '3456');
    const samples = samplesFrom(t, fileOf(t, 2)).map((s) => ({ ...s, characteristicId: 'ch-def' }));
    expect(await t.app.actions.importSamples('ch-len', samples)).toBeNull();
    expect(t.app.getState().error).toMatch(/another characteristic/);
  });
});

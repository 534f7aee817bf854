// @vitest-environment happy-dom
import { cleanup, fireEvent, render, screen, waitFor, within } from '@testing-library/preact';
import { afterEach, describe, expect, it } from 'vitest';
import type { SyncDetails, SyncView } from '../../src/app/app-state';
import { SyncSheet } from '../../src/ui/SyncSheet';
import { fakeActions, readyState } from './helpers';

afterEach(cleanup);

const details = (over: Partial<SyncDetails> = {}): SyncDetails => ({ problems: [], persisted: true, ...over });
const sheet = (sync: Partial<SyncView>, d: SyncDetails = details(), actions = fakeActions()) => {
  render(<SyncSheet state={readyState([], {}, { sync: { state: 'idle', pending: 0, rejected: 0, ...sync } })} details={d} actions={actions} />);
  return actions;
};

describe('SyncSheet', () => {
  it('says in words whether everything has reached the server', () => {
    sheet({});
    expect(screen.getByTestId('sync-summary').textContent).toBe('Everything recorded on this tablet has reached the site server. This tablet has not synced yet.');
    cleanup();
    sheet({ pending: 1 });
    expect(screen.getByTestId('sync-summary').textContent).toMatch(/^1 record is saved on this tablet and waiting to be sent\./);
    cleanup();
    sheet({ pending: 3, lastSuccessAt: '2026-12-02T08:15:00.000Z' });
    expect(screen.getByTestId('sync-summary').textContent).toMatch(/^3 records are saved on this tablet and waiting to be sent\. Last successful sync: .+\.$/);
  });

  it('lists what the server refused, with its reason', () => {
    sheet({ rejected: 2 }, details({
      problems: [
        { id: 'a', kind: 'sample', state: 'rejected', reason: 'Only an engineer or above may exclude a sample from the limits.', deviceSeq: 12 },
        { id: 'b', kind: 'response', state: 'conflict', reason: 'Another record has this id.', deviceSeq: 13 },
      ],
    }));
    const section = screen.getByRole('region', { name: 'Refused by the server (2)' });
    const items = within(section).getAllByRole('listitem').map((li) => li.textContent);
    expect(items).toEqual([
      'Sample #12 — refusedOnly an engineer or above may exclude a sample from the limits.',
      'Answer to a signal #13 — conflicts with a different record under the same idAnother record has this id.',
    ]);
  });

  it('flags a tablet clock that is off, in minutes', () => {
    sheet({ clockOffsetMs: -7 * 60_000, clockSkewed: true });
    expect(screen.getByText(/clock is about 7 min off the server's/)).toBeTruthy();
  });

  it('shows the last error only while something is wrong', () => {
    sheet({ state: 'offline', pending: 1, lastError: 'Could not reach the sync server: fetch failed' });
    expect(screen.getByRole('status').textContent).toBe('Last attempt: Could not reach the sync server: fetch failed');
    cleanup();
    sheet({ state: 'idle', lastError: 'old' });
    expect(screen.queryByRole('status')).toBeNull();
  });

  it('Sync now runs a sync and is disabled meanwhile; Close and Escape close', async () => {
    const actions = fakeActions();
    let finish!: () => void;
    actions.syncNow.mockImplementation(() => new Promise<void>((r) => { finish = r; }));
    sheet({}, details(), actions);
    fireEvent.click(screen.getByTestId('sync-now'));
    expect(actions.syncNow).toHaveBeenCalledTimes(1);
    expect((screen.getByTestId('sync-now') as HTMLButtonElement).disabled).toBe(true);
    finish();
    await waitFor(() => expect((screen.getByTestId('sync-now') as HTMLButtonElement).disabled).toBe(false));
    fireEvent.click(screen.getByRole('button', { name: 'Close' }));
    fireEvent.keyDown(screen.getByRole('dialog'), { key: 'Escape' });
    expect(actions.closeSyncDetails).toHaveBeenCalledTimes(2);
  });

  it('storage: protected or not, and the space used', () => {
    sheet({}, details({ persisted: false, usage: 12_300_000, quota: 2_000_000_000 }));
    const text = screen.getByTestId('sync-sheet').textContent!;
    expect(text).toContain('No — sync often; install the app to the home screen');
    expect(text).toContain('12.3 MB of 2.0 GB');
  });
});

// @vitest-environment happy-dom
import { cleanup, fireEvent, render, screen } from '@testing-library/preact';
import { afterEach, describe, expect, it } from 'vitest';
import type { SyncView } from '../../src/app/app-state';
import { describeSync, TopBar } from '../../src/ui/TopBar';
import { fakeActions, readyState } from './helpers';

afterEach(cleanup);

const sync = (s: Partial<SyncView>): SyncView => ({ state: 'idle', pending: 0, rejected: 0, ...s });

describe('describeSync', () => {
  it('idle with nothing waiting: all sent, with the time of the last sync', () => {
    const at = '2026-12-02T08:15:00.000Z';
    const clock = new Date(at).toLocaleTimeString(undefined, { hour: '2-digit', minute: '2-digit' });
    expect(describeSync(sync({ lastSuccessAt: at }))).toEqual({ text: `All sent · last sync ${clock}`, tone: 'clear' });
    expect(describeSync(sync({}))).toEqual({ text: 'All sent · last sync never', tone: 'clear' });
  });

  it('idle with records waiting', () => {
    expect(describeSync(sync({ pending: 3 }))).toEqual({ text: '3 waiting to send · last sync never', tone: 'waiting' });
  });

  it('syncing: progress when known', () => {
    expect(describeSync(sync({ state: 'syncing', pending: 10, progress: { pushed: 3, toPush: 10, pulled: 2 } }))).toEqual({ text: 'Sending 3 of 10…', tone: 'waiting' });
    expect(describeSync(sync({ state: 'syncing', pending: 10 }))).toEqual({ text: 'Sending…', tone: 'waiting' });
    expect(describeSync(sync({ state: 'syncing' }))).toEqual({ text: 'Syncing…', tone: 'waiting' });
  });

  it('syncing with nothing to send: says it is receiving, never "0/0"', () => {
    const receiving = describeSync(sync({ state: 'syncing', progress: { pushed: 0, toPush: 0, pulled: 500 } }));
    expect(receiving).toEqual({ text: 'Receiving updates… 500', tone: 'waiting' });
    expect(describeSync(sync({ state: 'syncing', progress: { pushed: 0, toPush: 0, pulled: 0 } }))).toEqual({ text: 'Checking for updates…', tone: 'waiting' });
    expect(receiving.text).not.toMatch(/0\/0/);
  });

  it('offline: waiting if anything is unsent, otherwise clear', () => {
    expect(describeSync(sync({ state: 'offline', pending: 2 }))).toEqual({ text: '2 waiting to send · no connection', tone: 'waiting' });
    expect(describeSync(sync({ state: 'offline' }))).toEqual({ text: 'All sent · no connection', tone: 'clear' });
  });

  it('error: the last try failed', () => {
    expect(describeSync(sync({ state: 'error', pending: 1, lastError: 'HTTP 500' }))).toEqual({ text: '1 waiting to send · last try failed', tone: 'failing' });
  });

  it('records refused by the server stay visible', () => {
    expect(describeSync(sync({ rejected: 2 }))).toEqual({ text: 'All sent · 2 refused by server', tone: 'failing' });
    expect(describeSync(sync({ pending: 1, rejected: 1 }))).toEqual({ text: '1 waiting to send · 1 refused by server', tone: 'failing' });
  });
});

describe('TopBar', () => {
  it('shows where the tablet is, the sync state and the person; the pills act', () => {
    const actions = fakeActions();
    render(<TopBar state={readyState([], {}, { sync: sync({ state: 'offline', pending: 4 }) })} actions={actions} />);
    expect(screen.getByTestId('where').textContent).toBe('Line 1 · Press 4');
    expect(screen.getByTestId('sync-pill').textContent).toContain('4 waiting to send · no connection');
    expect(screen.getByTestId('sync-pill').className).toContain('waiting');
    fireEvent.click(screen.getByTestId('sync-pill'));
    expect(actions.openSyncDetails).toHaveBeenCalledTimes(1);
    expect(screen.getByTestId('person-pill').textContent).toBe('Odile · operator');
    fireEvent.click(screen.getByTestId('person-pill'));
    expect(actions.signOut).toHaveBeenCalledTimes(1);
  });

  it('the sync pill’s title carries the last error', () => {
    render(<TopBar state={readyState([], {}, { sync: sync({ state: 'error', lastError: 'HTTP 503 from the server' }) })} actions={fakeActions()} />);
    expect(screen.getByTestId('sync-pill').getAttribute('title')).toBe('HTTP 503 from the server');
  });
});

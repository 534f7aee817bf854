/** Fake actions and hand-built state for the component tests. */
import { vi, type Mock } from 'vitest';
import type { AppActions, AppState, CharacteristicView } from '../../src/app/app-state';
import { buildCharacteristicView } from '../../src/app/build-view';
import type { Characteristic, Sample } from '../../src/schema';

export type FakeActions = AppActions & { readonly [K in keyof AppActions]: AppActions[K] & Mock };

/**
 * Every action is a vi.fn, made on first use; async actions resolve to true by default (override with
 * `actions.record.mockResolvedValueOnce(false)`).
 */
export function fakeActions(): FakeActions {
  const made = new Map<PropertyKey, Mock>();
  return new Proxy({} as FakeActions, {
    get(_target, key) {
      let fn = made.get(key);
      if (!fn) {
        fn = vi.fn(async () => true);
        made.set(key, fn);
      }
      return fn;
    },
  });
}

/** A ready state at station st-1 with the given characteristics and views. */
export function readyState(characteristics: readonly Characteristic[], views: Record<string, CharacteristicView>, overrides: Partial<AppState> = {}): AppState {
  return {
    stage: 'ready',
    device: { deviceId: 'tab-1', deviceName: 'Press 4 tablet', siteId: 'site-1' },
    person: { id: 'p-op', name: 'Odile', login: 'odile', role: 'operator', active: true },
    signedIn: [],
    setup: {
      sites: [{ id: 'site-1', name: 'Works' }],
      lines: [{ id: 'ln-1', siteId: 'site-1', name: 'Line 1' }, { id: 'ln-2', siteId: 'site-1', name: 'Line 2' }],
      stations: [{ id: 'st-1', lineId: 'ln-1', name: 'Press 4' }, { id: 'st-2', lineId: 'ln-2', name: 'Lathe 2' }],
      characteristics,
      phases: [],
      people: [],
      causeLists: [],
    },
    stationId: 'st-1',
    screen: { name: 'board' },
    views,
    sync: { state: 'idle', pending: 0, rejected: 0 },
    now: 0,
    theme: 'light',
    ...overrides,
  } as AppState;
}

export function view(ch: Characteristic, samples: readonly Sample[], now: number): CharacteristicView {
  return buildCharacteristicView(ch, [], samples, [], [], now);
}

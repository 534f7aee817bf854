import { describe, expect, it } from 'vitest';
import { estimateStorage, requestPersistentStorage } from '../../src/store/storage-health';

describe('requestPersistentStorage()', () => {
  it('returns the browser answer, true at once when already persisted, null without the API', async () => {
    expect(await requestPersistentStorage({ persist: async () => false, persisted: async () => false })).toBe(false);
    expect(await requestPersistentStorage({ persist: async () => true })).toBe(true);
    let asked = false;
    expect(await requestPersistentStorage({ persist: async () => (asked = true), persisted: async () => true })).toBe(true);
    expect(asked).toBe(false);
    expect(await requestPersistentStorage({})).toBeNull();
    expect(await requestPersistentStorage(undefined)).toBeNull();
  });
});

describe('estimateStorage()', () => {
  it('reports use against quota and warns from 80 % (sync.md §2.6)', async () => {
    expect(await estimateStorage({ estimate: async () => ({ usage: 50, quota: 100 }) })).toEqual({
      usage: 50,
      quota: 100,
      ratio: 0.5,
      isNearlyFull: false,
    });
    expect((await estimateStorage({ estimate: async () => ({ usage: 80, quota: 100 }) }))?.isNearlyFull).toBe(true);
    expect(await estimateStorage({ estimate: async () => ({}) })).toBeNull();
    expect(await estimateStorage({})).toBeNull();
  });
});

/** The parts of StorageManager used here; injectable so tests need no browser. */
export interface StorageManagerLike {
  persist?: () => Promise<boolean>;
  persisted?: () => Promise<boolean>;
  estimate?: () => Promise<{ usage?: number; quota?: number }>;
}

function defaultStorage(): StorageManagerLike | undefined {
  return typeof navigator !== 'undefined' ? (navigator as { storage?: StorageManagerLike }).storage : undefined;
}

/**
 * Asks the browser not to evict this site's data (sync.md §2.5). Returns true when granted, false when
 * refused, null when the browser has no such API. Show the answer to the user.
 */
export async function requestPersistentStorage(storage: StorageManagerLike | undefined = defaultStorage()): Promise<boolean | null> {
  if (!storage?.persist) return null;
  if (storage.persisted && (await storage.persisted())) return true;
  return storage.persist();
}

/** Fraction of the quota at which the app should warn (sync.md §2.6). */
export const STORAGE_WARN_RATIO = 0.8;

export interface StorageEstimateResult {
  usage: number;
  quota: number;
  /** usage / quota, 0..1 */
  ratio: number;
  isNearlyFull: boolean;
}

/** Current use of the site's storage, or null when unknown. */
export async function estimateStorage(storage: StorageManagerLike | undefined = defaultStorage()): Promise<StorageEstimateResult | null> {
  if (!storage?.estimate) return null;
  const { usage, quota } = await storage.estimate();
  if (usage === undefined || quota === undefined || quota <= 0) return null;
  const ratio = usage / quota;
  return { usage, quota, ratio, isNearlyFull: ratio >= STORAGE_WARN_RATIO };
}

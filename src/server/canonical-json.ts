import { createHash } from 'node:crypto';

/**
 * JSON with object keys sorted (recursively) and no whitespace, so the same content always
 * gives the same text whatever the key order the client used. `undefined` members are dropped,
 * as JSON.stringify does.
 */
export function canonicalJson(value: unknown): string {
  return JSON.stringify(sortKeys(value));
}

function sortKeys(value: unknown): unknown {
  if (Array.isArray(value)) return value.map(sortKeys);
  if (value !== null && typeof value === 'object') {
    // No prototype, so a key named "__proto__" stays data.
    const out = Object.create(null) as Record<string, unknown>;
    for (const key of Object.keys(value).sort()) out[key] = sortKeys((value as Record<string, unknown>)[key]);
    return out;
  }
  return value;
}

/** sha256 hex of the canonical JSON: the content hash that tells a true repeat from an id collision. */
export function contentHash(value: unknown): string {
  return createHash('sha256').update(canonicalJson(value), 'utf8').digest('hex');
}

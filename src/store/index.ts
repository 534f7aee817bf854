export * from './app-db';
export * from './store-error';
export * from './record-store';
export * from './resolve-corrections';
export * from './setup-store';
export * from './outbox-store';
export * from './meta-store';
export * from './storage-health';

export * from './api-client';
export * from './backoff';
export * from './ids';
export * from './offline-verifier';
export * from './sync-engine';

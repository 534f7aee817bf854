export * from './common';
export * from './setup';
export * from './records';
export * from './protocol';
export * from './admin';

/** The sync server's public surface, for main.ts and the end-to-end tests. */
export { createServer, DEFAULT_RATE_LIMITS, type CreateServerOptions, type RateLimits } from './create-server';
export { openSqliteStore, SqliteStore } from './store/sqlite-store';
export type { ServerStore } from './store/server-store';
export { seedDemo, hasDemo } from './demo/seed-demo';
export { buildDemoHistory, DEMO_SEED, type DemoHistory } from './demo/demo-history';
export { DEMO_PEOPLE, DEMO_SITE_ID, DEMO_SITE_NAME, DEMO_CHARACTERISTICS, DEMO_DEVICE_ID } from './demo/demo-site';
export { issueEnrolmentCode, ENROLMENT_CODE_MINUTES } from './routes/admin-enrolment-codes';
export { SESSION_HEADER } from './auth';

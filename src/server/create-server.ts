import Fastify, { type FastifyError, type FastifyInstance, type FastifyServerOptions } from 'fastify';
import { PROTOCOL_HEADER, PROTOCOL_VERSION } from '../schema/index';
import { HttpError } from './http-error';
import { RateLimiter } from './rate-limiter';
import { registerAdminDevicesRoutes } from './routes/admin-devices';
import { registerAdminEnrolmentCodesRoute } from './routes/admin-enrolment-codes';
import { registerAdminPeopleRoutes } from './routes/admin-people';
import { registerAdminPinRoute } from './routes/admin-pin';
import { registerEnrolRoute } from './routes/enrol';
import { registerHealthRoute } from './routes/health';
import { registerSetupRoute } from './routes/setup';
import { registerSignInRoute } from './routes/sign-in';
import { registerSyncPullRoute } from './routes/sync-pull';
import { registerSyncPushRoute } from './routes/sync-push';
import { SECURITY_HEADERS } from './security-headers';
import type { ServerContext } from './server-context';
import { serveStatic } from './static-files';
import type { ServerStore } from './store/server-store';

export interface RateLimits {
  /** Enrolment attempts per client address per window. */
  readonly enrolPerWindow: number;
  /** Failed sign-ins per device and per login per window. */
  readonly signInFailuresPerWindow: number;
  readonly windowMs: number;
}

export const DEFAULT_RATE_LIMITS: RateLimits = { enrolPerWindow: 10, signInFailuresPerWindow: 10, windowMs: 15 * 60_000 };

export interface CreateServerOptions {
  readonly store: ServerStore;
  /** Folder of the built app (vite's dist/). */
  readonly distDir: string;
  /** The clock; tests pass a fixed one. */
  readonly now?: () => Date;
  readonly logger?: FastifyServerOptions['logger'];
  readonly rateLimits?: Partial<RateLimits>;
}

/** Largest request body accepted (a full push of 200 records is far below this). */
export const BODY_LIMIT_BYTES = 1024 * 1024;

/** Builds the sync server: API routes under /api/v1, the built app everywhere else. Not yet listening. */
export function createServer(options: CreateServerOptions): FastifyInstance {
  const limits = { ...DEFAULT_RATE_LIMITS, ...options.rateLimits };
  const ctx: ServerContext = {
    store: options.store,
    now: options.now ?? (() => new Date()),
    enrolLimiter: new RateLimiter(limits.enrolPerWindow, limits.windowMs),
    signInLimiter: new RateLimiter(limits.signInFailuresPerWindow, limits.windowMs),
  };
  const app = Fastify({ logger: options.logger ?? false, bodyLimit: BODY_LIMIT_BYTES, trustProxy: false });

  app.addHook('onRequest', async (request) => {
    if (!isApiPath(request.url)) return;
    const sent = request.headers[PROTOCOL_HEADER];
    if (sent !== String(PROTOCOL_VERSION)) {
      throw new HttpError(
        426,
        'protocol-mismatch',
        sent === undefined
          ? `Requests must carry the "${PROTOCOL_HEADER}: ${PROTOCOL_VERSION}" header; reload the app to get the current version.`
          : `This server speaks protocol ${PROTOCOL_VERSION} but the app sent ${String(sent)}; reload the app to update it.`,
      );
    }
  });

  app.addHook('onSend', async (request, reply, payload) => {
    for (const [name, value] of Object.entries(SECURITY_HEADERS)) reply.header(name, value);
    // Tokens and quality records must not sit in shared caches.
    if (isApiPath(request.url)) reply.header('cache-control', 'no-store');
    return payload;
  });

  app.setErrorHandler(async (error: FastifyError | HttpError, request, reply) => {
    const http = toHttpError(error);
    if (http.statusCode >= 500) request.log.error({ err: error }, 'request failed');
    else request.log.info({ code: http.code, status: http.statusCode }, 'request refused');
    for (const [name, value] of Object.entries(http.headers)) reply.header(name, value);
    return reply.code(http.statusCode).send(http.toBody());
  });

  app.setNotFoundHandler(async (request, reply) => {
    if (isApiPath(request.url)) throw new HttpError(404, 'not-found', `There is no API route ${request.method} ${request.url.split('?')[0]}.`);
    if (request.method !== 'GET' && request.method !== 'HEAD') throw new HttpError(404, 'not-found', 'Only GET and HEAD are served outside /api.');
    return serveStatic(options.distDir, request, reply);
  });

  registerHealthRoute(app, ctx);
  registerEnrolRoute(app, ctx);
  registerSignInRoute(app, ctx);
  registerSyncPushRoute(app, ctx);
  registerSyncPullRoute(app, ctx);
  registerAdminEnrolmentCodesRoute(app, ctx);
  registerAdminPinRoute(app, ctx);
  registerAdminDevicesRoutes(app, ctx);
  registerAdminPeopleRoutes(app, ctx);
  registerSetupRoute(app, ctx);
  return app;
}

function isApiPath(url: string): boolean {
  return url === '/api' || url.startsWith('/api/') || url.startsWith('/api?');
}

/** Any error as an HttpError: ours as they are, fastify's 4xx mapped to stable codes, the rest a 500. */
function toHttpError(error: FastifyError | HttpError): HttpError {
  if (error instanceof HttpError) return error;
  const status = typeof error.statusCode === 'number' ? error.statusCode : 500;
  if (status === 413) return new HttpError(413, 'payload-too-large', `The request body is larger than ${BODY_LIMIT_BYTES} bytes; send fewer records at a time.`);
  if (status === 415) return new HttpError(415, 'unsupported-media-type', 'The request body must be JSON (content-type: application/json).');
  if (status === 400 && (error.code?.startsWith('FST_ERR_CTP_') || error instanceof SyntaxError)) {
    return new HttpError(400, 'bad-json', 'The request body is not valid JSON.');
  }
  if (status >= 400 && status < 500) return new HttpError(status, 'bad-request', 'The request could not be understood.');
  return new HttpError(500, 'internal', 'The server failed to handle this request; it has been logged. Try again shortly.');
}

import {
  EnrolRequest,
  EnrolResponse,
  ErrorBody,
  MAX_PULL_PAGE,
  PROTOCOL_HEADER,
  PROTOCOL_VERSION,
  PushResponse,
  SignInRequest,
  SignInResponse,
  SetupRecord,
  describeIssues,
  z,
  type DeviceRecord,
} from '../schema';
import { parseRetryAfter } from './backoff';

/**
 * Why a call failed. offline: no answer at all (network error or timeout: the outcome is unknown);
 * unauthorized: 401/403; protocol-mismatch: 426 (the app must update); rejected: another 4xx;
 * server: 5xx, 408 or 429 (try again later); bad-response: an answer that is not our schema (e.g. a
 * captive portal's 200 HTML page, sync.md §2.15).
 */
export type ApiErrorCode = 'offline' | 'unauthorized' | 'protocol-mismatch' | 'rejected' | 'server' | 'bad-response';

export class ApiError extends Error {
  constructor(
    readonly code: ApiErrorCode,
    message: string,
    readonly details: { status?: number; serverCode?: string; retryAfterMs?: number } = {},
    /** The server's own sentence for a person, when it sent one (ErrorBody.message). */
    readonly serverMessage?: string,
  ) {
    super(message);
    this.name = 'ApiError';
  }
}

export interface ApiConfig {
  /** e.g. 'https://sync.example/api/v1' (no trailing slash needed). */
  baseUrl: string;
  fetch?: typeof fetch;
  /** Abort a call that has not answered after this long (default 30 s); counted as offline. */
  timeoutMs?: number;
  now?: () => number;
}

/** One pull page; entries are validated one by one when stored (a bad one is skipped, see applyPulledEntries). */
export interface PullPage {
  serverEpoch: string;
  entries: unknown[];
  next: number;
  hasMore: boolean;
  /** The server's HTTP Date header (ms), for the clock-offset estimate (sync.md §2.7); absent if not sent. */
  serverDateMs?: number;
}

const PullEnvelope = z.object({
  serverEpoch: z.string(),
  entries: z.array(z.unknown()),
  next: z.int().check(z.minimum(0)),
  hasMore: z.boolean(),
});

export interface CallOptions {
  method: 'GET' | 'POST';
  path: string;
  token?: string;
  /** A person's session token (the admin routes), sent in SESSION_HEADER. */
  session?: string;
  body?: unknown;
}

/** Header of a person's session token (the server's auth.ts reads it). */
export const SESSION_HEADER = 'x-plumbline-session';

/** One API call: the answer checked against `schema` (a 204 answer is checked as null), failures as ApiError. */
export async function call<T>(config: ApiConfig, options: CallOptions, schema: z.ZodMiniType<T>): Promise<T> {
  return (await callWithDate(config, options, schema)).data;
}

async function callWithDate<T>(
  config: ApiConfig,
  options: CallOptions,
  schema: z.ZodMiniType<T>,
): Promise<{ data: T; serverDateMs?: number }> {
  const doFetch = config.fetch ?? globalThis.fetch;
  const now = config.now ?? Date.now;
  const headers: Record<string, string> = { [PROTOCOL_HEADER]: String(PROTOCOL_VERSION), accept: 'application/json' };
  if (options.token !== undefined) headers.authorization = `Bearer ${options.token}`;
  if (options.session !== undefined) headers[SESSION_HEADER] = options.session;
  if (options.body !== undefined) headers['content-type'] = 'application/json';
  const controller = new AbortController();
  const timer = setTimeout(() => controller.abort(), config.timeoutMs ?? 30_000);
  let response: Response;
  let text: string;
  try {
    response = await doFetch(config.baseUrl.replace(/\/+$/, '') + options.path, {
      method: options.method,
      headers,
      ...(options.body !== undefined ? { body: JSON.stringify(options.body) } : {}),
      signal: controller.signal,
    });
    text = await response.text();
  } catch (e) {
    const why = controller.signal.aborted ? 'the server did not answer in time' : e instanceof Error ? e.message : String(e);
    throw new ApiError('offline', `Could not reach the sync server: ${why}`);
  } finally {
    clearTimeout(timer);
  }

  if (response.status === 204) text = 'null';
  let json: unknown;
  let isJson = true;
  try {
    json = JSON.parse(text);
  } catch {
    isJson = false;
  }
  const status = response.status;
  if (!response.ok) {
    const errorBody = isJson ? ErrorBody.safeParse(json) : undefined;
    const serverCode = errorBody?.success ? errorBody.data.error : undefined;
    const serverMessage = errorBody?.success ? errorBody.data.message : `HTTP ${status}`;
    const retryAfterMs = parseRetryAfter(response.headers.get('retry-after'), now());
    const details = { status, ...(serverCode !== undefined ? { serverCode } : {}), ...(retryAfterMs !== undefined ? { retryAfterMs } : {}) };
    const said = errorBody?.success ? serverMessage : undefined;
    if (status === 401 || status === 403) throw new ApiError('unauthorized', `Not allowed: ${serverMessage}`, details, said);
    if (status === 426) throw new ApiError('protocol-mismatch', `This app version no longer matches the server: ${serverMessage}`, details, said);
    if (status >= 500 || status === 408 || status === 429) throw new ApiError('server', `The sync server is unavailable: ${serverMessage}`, details, said);
    if (status >= 400) throw new ApiError('rejected', `The sync server refused the request: ${serverMessage}`, details, said);
    throw new ApiError('bad-response', `Unexpected answer from the sync server (HTTP ${status}).`, details);
  }
  if (!isJson) throw new ApiError('bad-response', 'The sync server did not answer with JSON (a login page or proxy?).', { status });
  const parsed = schema.safeParse(json);
  if (!parsed.success) {
    throw new ApiError('bad-response', `The sync server's answer has the wrong shape:\n${describeIssues(parsed.error)}`, { status });
  }
  const serverDateMs = Date.parse(response.headers.get('date') ?? '');
  return { data: parsed.data, ...(Number.isNaN(serverDateMs) ? {} : { serverDateMs }) };
}

function checkRequest<T>(schema: z.ZodMiniType<T>, value: unknown, what: string): T {
  const parsed = schema.safeParse(value);
  if (!parsed.success) throw new ApiError('rejected', `${what} is not valid:\n${describeIssues(parsed.error)}`);
  return parsed.data;
}

/** POST /enrol: exchange a one-time code for a device token. */
export async function enrolDevice(config: ApiConfig, request: EnrolRequest): Promise<EnrolResponse> {
  const body = checkRequest(EnrolRequest, request, 'The enrolment');
  return call(config, { method: 'POST', path: '/enrol', body }, EnrolResponse);
}

/** POST /sign-in with the device token: a person's login and PIN. */
export async function signIn(config: ApiConfig, deviceToken: string, request: SignInRequest): Promise<SignInResponse> {
  const body = checkRequest(SignInRequest, request, 'The sign-in');
  return call(config, { method: 'POST', path: '/sign-in', token: deviceToken, body }, SignInResponse);
}

/** POST /sync/push: a batch of device records; the answer has one result per record. */
export function pushRecords(
  config: ApiConfig,
  deviceToken: string,
  request: { batchId: string; records: readonly DeviceRecord[]; deviceSeqs?: readonly number[] },
): Promise<PushResponse> {
  return call(config, { method: 'POST', path: '/sync/push', token: deviceToken, body: request }, PushResponse);
}

/** GET /sync/pull?after=N&limit=M: the next page of the server's log. */
export async function pullEntries(config: ApiConfig, deviceToken: string, after: number, limit: number = MAX_PULL_PAGE): Promise<PullPage> {
  const path = `/sync/pull?after=${encodeURIComponent(String(after))}&limit=${encodeURIComponent(String(limit))}`;
  const { data, serverDateMs } = await callWithDate(config, { method: 'GET', path, token: deviceToken }, PullEnvelope);
  return { ...data, ...(serverDateMs !== undefined ? { serverDateMs } : {}) };
}

/** The server's answer to a set-up change: the log position of each entry. */
export const SetupChangeResult = z.object({
  serverEpoch: z.string(),
  results: z.array(z.object({ kind: z.string(), id: z.string(), serverSeq: z.int() })),
});
export type SetupChangeResult = z.infer<typeof SetupChangeResult>;

/** POST /setup with a person's session: new versions of set-up entities (engineer: process; admin: also people and site). */
export async function postSetup(config: ApiConfig, deviceToken: string, sessionToken: string, entries: readonly SetupRecord[]): Promise<SetupChangeResult> {
  const body = checkRequest(z.object({ entries: z.array(SetupRecord).check(z.minLength(1), z.maxLength(100)) }), { entries }, 'The set-up change');
  return call(config, { method: 'POST', path: '/setup', token: deviceToken, session: sessionToken, body }, SetupChangeResult);
}

/** The calls the sync engine needs; a fake can stand in for tests. */
export interface SyncApi {
  pushRecords(deviceToken: string, request: { batchId: string; records: readonly DeviceRecord[]; deviceSeqs?: readonly number[] }): Promise<PushResponse>;
  pullEntries(deviceToken: string, after: number, limit?: number): Promise<PullPage>;
}

export interface ApiClient extends SyncApi {
  enrolDevice(request: EnrolRequest): Promise<EnrolResponse>;
  signIn(deviceToken: string, request: SignInRequest): Promise<SignInResponse>;
  /** Optional so that older fakes still type-check; the real client always has it. */
  postSetup?(deviceToken: string, sessionToken: string, entries: readonly SetupRecord[]): Promise<SetupChangeResult>;
}

/** Binds the calls to one server. */
export function createApiClient(config: ApiConfig): ApiClient {
  return {
    enrolDevice: (request) => enrolDevice(config, request),
    signIn: (token, request) => signIn(config, token, request),
    pushRecords: (token, request) => pushRecords(config, token, request),
    pullEntries: (token, after, limit) => pullEntries(config, token, after, limit),
    postSetup: (token, session, entries) => postSetup(config, token, session, entries),
  };
}

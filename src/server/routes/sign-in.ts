import type { FastifyInstance } from 'fastify';
import { SignInRequest, type Person, type SignInResponse } from '../../schema/index';
import { authenticateDevice } from '../auth';
import { HttpError } from '../http-error';
import { parseInput } from '../parse-input';
import { verifyPin } from '../pin-hash';
import type { ServerContext } from '../server-context';
import { hashSecret, newToken } from '../tokens';

/** How long a session lasts: one long shift. */
export const SESSION_HOURS = 12;

// Checked when the login is unknown, so a wrong login costs the same time as a wrong PIN.
const DUMMY_PIN_HASH = { salt: '00'.repeat(16), hash: '00'.repeat(32) };

/** POST /api/v1/sign-in: a person signs in on an enrolled tablet with login and PIN. */
export function registerSignInRoute(app: FastifyInstance, ctx: ServerContext): void {
  app.post('/api/v1/sign-in', async (request): Promise<SignInResponse> => {
    const device = await authenticateDevice(ctx, request);
    const body = parseInput(SignInRequest, request.body, 'sign-in request');
    const now = ctx.now();
    const keys = [`device:${device.id}`, `login:${device.siteId}:${body.login.toLowerCase()}`];
    const wait = Math.max(...keys.map((k) => ctx.signInLimiter.retryAfterSeconds(k, now.getTime())));
    if (wait > 0) {
      throw new HttpError(429, 'rate-limited', `Too many failed sign-ins; try again in ${wait} seconds.`, { 'retry-after': String(wait) });
    }

    const person = await findPerson(ctx, device.siteId, body.login);
    const secrets = person && (await ctx.store.getPersonSecrets(person.id));
    const pinOk = await verifyPin(body.pin, secrets ? { salt: secrets.pinSalt, hash: secrets.pinHash } : DUMMY_PIN_HASH);
    if (!person || !secrets || !pinOk) {
      for (const k of keys) ctx.signInLimiter.hit(k, now.getTime());
      throw new HttpError(401, 'sign-in-failed', 'The login or PIN is not right.');
    }
    // Said only to someone who knows the PIN, so it tells a guesser nothing.
    if (!person.active) {
      throw new HttpError(401, 'person-inactive', `${person.name}'s access to this site has been withdrawn by an administrator; ask the site admin if this is a mistake.`);
    }
    ctx.signInLimiter.reset(keys[1] ?? '');

    const sessionToken = newToken();
    await ctx.store.createSession({
      tokenHash: hashSecret(sessionToken),
      personId: person.id,
      deviceId: device.id,
      createdAt: now.toISOString(),
      expiresAt: new Date(now.getTime() + SESSION_HOURS * 3_600_000).toISOString(),
    });
    request.log.info({ personId: person.id, deviceId: device.id }, 'signed in');
    return {
      person,
      sessionToken,
      offlineVerifier: { salt: secrets.verifierSalt, hash: secrets.verifierHash, iterations: secrets.verifierIterations },
    };
  });
}

/** Logins are matched without regard to case; an active person comes before an inactive one with the same login. */
async function findPerson(ctx: ServerContext, siteId: string, login: string): Promise<Person | undefined> {
  const people = await ctx.store.listSetup(siteId, 'person');
  const wanted = login.toLowerCase();
  const matching = people.map((p) => p.body).filter((p) => p.login.toLowerCase() === wanted);
  return matching.find((p) => p.active) ?? matching[0];
}

import type { FastifyInstance } from 'fastify';
import { pinRefOf, SetPinRequest } from '../../schema/index';
import { authenticateSession, requireRole } from '../auth';
import { HttpError } from '../http-error';
import { parseInput } from '../parse-input';
import { hashPin, newOfflineVerifier } from '../pin-hash';
import type { ServerContext } from '../server-context';

/**
 * POST /api/v1/admin/pin (admin session) {personId, pin} → 204: sets a person's PIN and a new offline verifier.
 * The PIN follows the rule for new PINs (schema/admin.ts: 4–12 digits, not guessable).
 */
export function registerAdminPinRoute(app: FastifyInstance, ctx: ServerContext): void {
  app.post('/api/v1/admin/pin', async (request, reply) => {
    const { person: admin, siteId } = await authenticateSession(ctx, request);
    requireRole(admin, 'admin', 'set PINs');
    const body = parseInput(SetPinRequest, request.body, 'PIN change');
    const target = await ctx.store.getSetup('person', body.personId);
    if (!target || target.siteId !== siteId) throw new HttpError(400, 'bad-request', `Person "${body.personId}" is not part of this site.`);
    const secrets = await personSecrets(body.personId, body.pin, ctx.now());
    await ctx.store.setPersonSecrets(secrets);
    // A new version of the person names the new PIN, so tablets stop taking the old one offline.
    const person = { ...target.body, pinRef: await pinRefOf(secrets.verifierSalt) };
    await ctx.store.appendSetup([{ siteId, record: { kind: 'person', id: person.id, body: person } }], secrets.updatedAt);
    request.log.info({ by: admin.id, personId: body.personId }, 'PIN set');
    return reply.code(204).send();
  });
}

/** The stored secrets for a PIN: scrypt hash for the server, PBKDF2 verifier for the tablets. */
export async function personSecrets(personId: string, pin: string, now: Date) {
  const [hashed, verifier] = await Promise.all([hashPin(pin), newOfflineVerifier(pin)]);
  return {
    personId,
    pinHash: hashed.hash,
    pinSalt: hashed.salt,
    verifierSalt: verifier.salt,
    verifierHash: verifier.hash,
    verifierIterations: verifier.iterations,
    updatedAt: now.toISOString(),
  };
}

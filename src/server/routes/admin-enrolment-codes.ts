import type { FastifyInstance } from 'fastify';
import { z } from '../../schema/index';
import { authenticateSession, requireRole } from '../auth';
import { parseInput } from '../parse-input';
import type { ServerContext } from '../server-context';
import type { ServerStore } from '../store/server-store';
import { hashSecret, newEnrolmentCode, normaliseEnrolmentCode } from '../tokens';

/** Lifetime of an enrolment code made by an administrator in the app. */
export const ENROLMENT_CODE_MINUTES = 15;

const CreateCodeRequest = z.object({ ttlMinutes: z.optional(z.int().check(z.minimum(1), z.maximum(24 * 60))) });

export interface EnrolmentCodeIssued {
  readonly code: string;
  readonly expiresAt: string;
}

/** Makes a one-time enrolment code for a site and stores only its hash. */
export async function issueEnrolmentCode(
  store: ServerStore,
  siteId: string,
  createdBy: string,
  now: Date,
  ttlMinutes = ENROLMENT_CODE_MINUTES,
): Promise<EnrolmentCodeIssued> {
  const code = newEnrolmentCode();
  const expiresAt = new Date(now.getTime() + ttlMinutes * 60_000).toISOString();
  await store.createEnrolmentCode({ codeHash: hashSecret(normaliseEnrolmentCode(code)), siteId, createdBy, createdAt: now.toISOString(), expiresAt });
  return { code, expiresAt };
}

/** POST /api/v1/admin/enrolment-codes (admin session) → {code, expiresAt}. Body: optional {ttlMinutes}. */
export function registerAdminEnrolmentCodesRoute(app: FastifyInstance, ctx: ServerContext): void {
  app.post('/api/v1/admin/enrolment-codes', async (request, reply): Promise<EnrolmentCodeIssued> => {
    const { person, siteId } = await authenticateSession(ctx, request);
    requireRole(person, 'admin', 'create enrolment codes');
    const body = parseInput(CreateCodeRequest, request.body ?? {}, 'enrolment code request');
    const issued = await issueEnrolmentCode(ctx.store, siteId, person.id, ctx.now(), body.ttlMinutes);
    request.log.info({ by: person.id, expiresAt: issued.expiresAt }, 'enrolment code issued');
    reply.code(201);
    return issued;
  });
}

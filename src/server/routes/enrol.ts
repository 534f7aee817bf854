import type { FastifyInstance } from 'fastify';
import { EnrolRequest, type EnrolResponse } from '../../schema/index';
import { HttpError } from '../http-error';
import { parseInput } from '../parse-input';
import type { ServerContext } from '../server-context';
import { hashSecret, newDeviceId, newToken, normaliseEnrolmentCode } from '../tokens';

/** POST /api/v1/enrol: a tablet exchanges a one-time code for a device token. */
export function registerEnrolRoute(app: FastifyInstance, ctx: ServerContext): void {
  app.post('/api/v1/enrol', async (request): Promise<EnrolResponse> => {
    const now = ctx.now();
    const wait = ctx.enrolLimiter.retryAfterSeconds(request.ip, now.getTime());
    if (wait > 0) {
      throw new HttpError(429, 'rate-limited', `Too many enrolment attempts from this address; try again in ${wait} seconds.`, {
        'retry-after': String(wait),
      });
    }
    // Failed attempts count: codes are short, so guessing must stay slow, while a site that
    // enrols many tablets from one address with good codes is not held up.
    const fail = (error: HttpError): never => {
      ctx.enrolLimiter.hit(request.ip, now.getTime());
      throw error;
    };
    let body: EnrolRequest;
    try {
      body = parseInput(EnrolRequest, request.body, 'enrolment request');
    } catch (error) {
      return fail(error as HttpError);
    }

    const deviceToken = newToken();
    const deviceId = newDeviceId();
    const result = await ctx.store.redeemEnrolmentCode(hashSecret(normaliseEnrolmentCode(body.code)), now.toISOString(), {
      id: deviceId,
      name: body.deviceName,
      tokenHash: hashSecret(deviceToken),
      enrolledAt: now.toISOString(),
    });
    if (!result.ok) {
      if (result.reason === 'used') fail(new HttpError(409, 'enrolment-code-used', 'This enrolment code has already been used; ask an administrator for a new one.'));
      if (result.reason === 'expired') fail(new HttpError(410, 'enrolment-code-expired', 'This enrolment code has expired; ask an administrator for a new one.'));
      return fail(new HttpError(400, 'enrolment-code-invalid', 'This enrolment code is not known; check it and type it again.'));
    }
    request.log.info({ deviceId, siteId: result.siteId }, 'device enrolled');
    return { deviceId, deviceToken, siteId: result.siteId };
  });
}

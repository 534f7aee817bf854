import {
  DeviceListResponse,
  EnrolmentCodeIssued,
  EnrolmentCodeRequest,
  NewPersonRequest,
  PeopleListResponse,
  PersonChangeRequest,
  PersonResponse,
  SetPinRequest,
  describeIssues,
  z,
  type AdminDevice,
  type AdminPerson,
  type Person,
} from '../schema';
import { ApiError, call, type ApiConfig } from './api-client';

/** The site admin's calls. Each needs the admin's session token from an online sign-in. */
export interface AdminApi {
  listPeople(session: string): Promise<AdminPerson[]>;
  addPerson(session: string, request: NewPersonRequest): Promise<Person>;
  changePerson(session: string, personId: string, change: PersonChangeRequest): Promise<Person>;
  setPin(session: string, request: SetPinRequest): Promise<void>;
  listDevices(session: string): Promise<AdminDevice[]>;
  revokeDevice(session: string, deviceId: string): Promise<void>;
  /** Gives a withdrawn tablet back: its same token works again (nothing changes for a tablet in use). */
  reinstateDevice(session: string, deviceId: string): Promise<void>;
  /** A one-time code; `ttlMinutes` (1 to 1440) defaults to the server's 15 minutes. */
  issueEnrolmentCode(session: string, ttlMinutes?: number): Promise<EnrolmentCodeIssued>;
}

const NoContent = z.null();

/** Checks a request body before it leaves the tablet, with the same schema the server uses. */
function checked<T>(schema: z.ZodMiniType<T>, value: unknown, what: string): T {
  const parsed = schema.safeParse(value);
  if (!parsed.success) throw new ApiError('rejected', `${what} is not valid:\n${describeIssues(parsed.error)}`);
  return parsed.data;
}

/** Binds the admin calls to one server. */
export function createAdminApi(config: ApiConfig): AdminApi {
  return {
    async listPeople(session) {
      return (await call(config, { method: 'GET', path: '/admin/people', session }, PeopleListResponse)).people;
    },
    async addPerson(session, request) {
      const body = checked(NewPersonRequest, request, 'The new person');
      return (await call(config, { method: 'POST', path: '/admin/people', session, body }, PersonResponse)).person;
    },
    async changePerson(session, personId, change) {
      const body = checked(PersonChangeRequest, change, 'The change');
      const path = `/admin/people/${encodeURIComponent(personId)}`;
      return (await call(config, { method: 'POST', path, session, body }, PersonResponse)).person;
    },
    async setPin(session, request) {
      const body = checked(SetPinRequest, request, 'The new PIN');
      await call(config, { method: 'POST', path: '/admin/pin', session, body }, NoContent);
    },
    async listDevices(session) {
      return (await call(config, { method: 'GET', path: '/admin/devices', session }, DeviceListResponse)).devices;
    },
    async revokeDevice(session, deviceId) {
      await call(config, { method: 'POST', path: `/admin/devices/${encodeURIComponent(deviceId)}/revoke`, session, body: {} }, NoContent);
    },
    async reinstateDevice(session, deviceId) {
      await call(config, { method: 'POST', path: `/admin/devices/${encodeURIComponent(deviceId)}/reinstate`, session, body: {} }, NoContent);
    },
    async issueEnrolmentCode(session, ttlMinutes) {
      const body = checked(EnrolmentCodeRequest, ttlMinutes === undefined ? {} : { ttlMinutes }, 'The code request');
      return call(config, { method: 'POST', path: '/admin/enrolment-codes', session, body }, EnrolmentCodeIssued);
    },
  };
}

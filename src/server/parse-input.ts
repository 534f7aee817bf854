import { describeIssues, z } from '../schema/index';
import { HttpError } from './http-error';

/** Validates a request part with a shared schema; a failure is a 400 that lists each problem. */
export function parseInput<S extends z.core.$ZodType>(schema: S, value: unknown, what: string): z.core.output<S> {
  const result = z.safeParse(schema, value);
  if (!result.success) throw new HttpError(400, 'bad-request', `The ${what} is not valid:\n${describeIssues(result.error)}`);
  return result.data;
}

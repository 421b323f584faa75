import type { z } from 'zod';
import { AppError, fieldErrorsFromZod } from './errors';

/** Parses input with a shared zod schema; a failure is a 400 naming every bad field. */
export function parse<S extends z.ZodType>(schema: S, input: unknown, what = 'Some fields are not valid'): z.output<S> {
  const result = schema.safeParse(input);
  if (!result.success) throw new AppError(400, what, fieldErrorsFromZod(result.error));
  return result.data;
}

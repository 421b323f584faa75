import { z } from 'zod';

/** Metadata every synced record carries on the wire. */
export interface RecordMeta {
  id: string;
  rev: number;
  updatedAt: string;
  updatedBy: string | null;
  deleted: boolean;
}

export const uuid = (what = 'id') => z.string().uuid(`${what} must be a UUID`);
export const isoDateTime = (what = 'time') => z.string().datetime({ offset: true, message: `${what} must be an ISO-8601 date-time` });
export const isoDate = (what = 'date') => z.string().regex(/^\d{4}-\d{2}-\d{2}$/, `${what} must be a date YYYY-MM-DD`);
/** Free text shown to people: stored verbatim (the views escape it), length-limited. */
export const text = (max = 2000) => z.string().max(max, `At most ${max} characters`);
export const name = (what = 'name') => z.string().trim().min(1, `Enter a ${what}`).max(200, `The ${what} is too long`);

/** A number in a hard range; the message names the range and unit. */
export const ranged = (min: number, max: number, unit: string, what = 'value') =>
  z
    .number({ message: `${what} must be a number` })
    .finite(`${what} must be a finite number`)
    .min(min, `${what} must be at least ${min} ${unit}`)
    .max(max, `${what} must be at most ${max} ${unit}`);

export interface Warning {
  path: string;
  message: string;
}

import type { ValueTransformer } from 'typeorm';

/** PostgreSQL bigint arrives as a string; revisions and sequences stay far below 2^53, so numbers are safe. */
export const bigintAsNumber: ValueTransformer = {
  to: (v: number | null | undefined) => v,
  from: (v: string | null) => (v === null || v === undefined ? v : Number(v)),
};

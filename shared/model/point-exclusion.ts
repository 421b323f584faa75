import { z } from 'zod';
import { exclusionProblems } from '../flux/point-exclusion';

/** Reasons the Bench offers for leaving points out; any other reason may be typed instead. */
export const EXCLUSION_REASONS = ['Spike', 'Chamber knocked or stepped near', 'Analyzer glitch', 'Pump or tube fault'] as const;

const reason = z.string().trim().min(1, 'Say why these points are left out').max(300, 'At most 300 characters');
const sampleIndex = z.number({ message: 'A point is a sample number' }).int('A point is a whole sample number');

/** One sample (by its position in the series) the lab left out of the fit, and why. */
export const pointExclusionSchema = z.object({ index: sampleIndex, reason });
export type PointExclusion = z.infer<typeof pointExclusionSchema>;

/** A closure's exclusions: at most one per sample (the series holds at most 20 000). */
export const reviewExclusionsSchema = z.array(pointExclusionSchema).max(20000, 'At most 20 000 excluded points');

/** Bench request: leave these points out, for this reason. */
export const excludePointsSchema = z.object({
  indices: z
    .array(sampleIndex, { message: 'Name the points to leave out (indices)' })
    .min(1, 'Name at least one point to leave out')
    .max(20000),
  reason,
});
/** Bench request: put these excluded points back into the fit. */
export const restorePointsSchema = z.object({
  indices: z
    .array(sampleIndex, { message: 'Name the excluded points to put back (indices)' })
    .min(1, 'Name at least one point to put back')
    .max(20000),
});

type ClosureLike = {
  series: { tS: (number | null)[]; co2Ppm: (number | null)[]; h2oMmolMol?: (number | null)[] | null; co2IsDry?: boolean };
  settleS: number;
  reviewSettleS: number | null;
  reviewWindowEndS: number | null;
  reviewExclusions: PointExclusion[];
};

/** The record rule (every write path): exclusions name samples of the series, once each, and leave a fit possible. */
export function checkExclusions(c: ClosureLike, ctx: z.RefinementCtx): void {
  const problems = exclusionProblems(
    c.series,
    c.reviewSettleS ?? c.settleS,
    c.reviewWindowEndS,
    c.reviewExclusions.map((e) => e.index),
  );
  for (const p of problems) {
    ctx.addIssue({
      code: 'custom',
      path: p.index === null ? ['reviewExclusions'] : ['reviewExclusions', p.index, 'index'],
      message: p.message,
    });
  }
}

/**
 * The lab's exclusion of single samples or a spike from a closure's fit (common practice: a
 * disturbance the analyzer saw is left out, never edited, and the raw series is kept). The fit
 * itself leaves them out through `excludedIndices` (closure-window.ts); this file holds the rules
 * for which exclusions a closure can take, used by the record's schema on every write path.
 */
import { usablePointCount, type WindowSeries } from './closure-window';

export { usablePointCount };
import { QC_THRESHOLDS } from './qc-flags';

export interface ExclusionProblem {
  /** Position in the list of excluded indices the problem is about; null: the list as a whole. */
  index: number | null;
  message: string;
}

type Series = Pick<WindowSeries, 'tS' | 'co2Ppm' | 'h2oMmolMol' | 'co2IsDry'>;

/**
 * What is wrong with leaving `indices` out of a closure fitted from `settleS` to `windowEndS`:
 * an index that names no sample, an index named twice, or so few usable points left in the fit
 * window that no line can be fitted (fewer than QC_THRESHOLDS.minPointsLinear). Empty: fine.
 */
export function exclusionProblems(
  series: Series,
  settleS: number,
  windowEndS: number | null,
  indices: readonly number[],
): ExclusionProblem[] {
  if (!indices.length) return [];
  const len = series.tS.length;
  const problems: ExclusionProblem[] = [];
  const seen = new Set<number>();
  indices.forEach((i, k) => {
    if (!Number.isInteger(i) || i < 0 || i >= len) {
      problems.push({ index: k, message: `Point ${i} is not in this closure: its samples are numbered 0 to ${len - 1}` });
    } else if (seen.has(i)) {
      problems.push({ index: k, message: `Point ${i} is excluded twice` });
    }
    seen.add(i);
  });
  if (problems.length) return problems;
  const min = QC_THRESHOLDS.minPointsLinear;
  const before = usablePointCount({ ...series, settleS, windowEndS, excludedIndices: [] });
  const after = usablePointCount({ ...series, settleS, windowEndS, excludedIndices: indices });
  // A closure that never had enough points is not made worse by leaving out points outside its window.
  if (after < min && after < before) {
    problems.push({
      index: null,
      message: `Leaving out these points keeps ${after} usable points in the fit window; a fit needs at least ${min}`,
    });
  }
  return problems;
}

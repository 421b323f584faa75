import { Pipe, type PipeTransform } from '@angular/core';
import { flagAdvice } from '../../../../shared/flux/flag-advice';

/**
 * `{{ code | flagWords }}` → what the QC flag means in plain words; `{{ code | flagWords: 'advice' }}`
 * → what to do about it. From the one flag table (shared/flux/flag-advice.ts) the Walk's closure
 * card uses, so the Bench and the Board say the same; the code itself is for lab staff only.
 */
@Pipe({ name: 'flagWords' })
export class FlagWordsPipe implements PipeTransform {
  transform(code: string, part: 'words' | 'advice' = 'words'): string {
    return flagAdvice(code)[part];
  }
}

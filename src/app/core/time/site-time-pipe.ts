import { Pipe, type PipeTransform } from '@angular/core';
import { formatSiteTime, type SiteTimeOptions } from '../../../../shared/time/site-time';

/**
 * `{{ at | siteTime: site.timezone }}` → "2026-07-01 14:05 GMT+2": a time a person reads, in the
 * site's zone and naming it (shared/time/site-time is the one home of the rule). Pure: the same
 * instant and zone always read the same.
 */
@Pipe({ name: 'siteTime' })
export class SiteTimePipe implements PipeTransform {
  transform(instant: string | number | Date | null | undefined, timeZone: string | null | undefined, opts: SiteTimeOptions = {}): string {
    return formatSiteTime(instant, timeZone || 'UTC', opts);
  }
}

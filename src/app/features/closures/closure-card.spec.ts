import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import type { LocalRecord } from '../../core/db/db-schema';
import { ClosureCard } from './closure-card';
import type { SpotInputs } from './closure-flux';
import { SpotChart } from './spot-chart';

/** jsdom has no canvas: the chart is replaced by an empty element with the same input. */
@Component({ selector: 'fw-spot-chart', template: '', changeDetection: ChangeDetectionStrategy.OnPush })
class NoChart {
  readonly data = input<unknown>();
}

describe('ClosureCard: days in the site’s zone', () => {
  it('when the collar has earlier fluxes, then each names the site’s day it was measured, not the UTC day', () => {
    TestBed.configureTestingModule({ imports: [ClosureCard] });
    TestBed.overrideComponent(ClosureCard, { remove: { imports: [SpotChart] }, add: { imports: [NoChart] } });
    const fixture = TestBed.createComponent(ClosureCard);
    const site = { id: 's', rev: 1, timezone: 'Pacific/Auckland' } as LocalRecord;
    fixture.componentRef.setInput('closure', { id: 'z', rev: 1, analyzerId: 'a', chamberOnAt: null, chamberOffAt: null } as LocalRecord);
    fixture.componentRef.setInput('inputs', {
      site,
      collar: { id: 'k', rev: 1 } as LocalRecord,
      profiles: [],
      offsetSets: [],
      analyzer: null,
      ambientChecks: [],
      visitAirTempC: null,
    } as SpotInputs);
    // 20:30 UTC on 1 June is 08:30 on 2 June in Auckland (NZST, UTC+12).
    fixture.componentRef.setInput('previous', [{ id: 'p1', startedAt: '2026-06-01T20:30:00.000Z', fluxUmolM2S: 2.5 }]);
    fixture.detectChanges();
    expect((fixture.nativeElement as HTMLElement).querySelector('.previous')!.textContent!.replace(/\s+/g, ' ')).toContain(
      '2.50 (2026-06-02)',
    );
  });
});

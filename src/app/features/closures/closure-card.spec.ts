import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { deviceRecord } from '../../core/db/testing/test-db';
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
    const S = '11111111-1111-4111-8111-111111111111';
    const K = '33333333-3333-4333-8333-333333333333';
    const site = deviceRecord('site', { id: S, name: 'Test site', timezone: 'Pacific/Auckland', elevationM: null });
    const ids = { siteId: S, visitId: S, collarId: K, campaignId: S };
    const noSeries = { tS: [], co2Ppm: [] };
    fixture.componentRef.setInput(
      'closure',
      deviceRecord('closure', { id: 'z', ...ids, analyzerId: S, startedAt: '2026-06-03T20:30:00.000Z', settleS: 20, series: noSeries }),
    );
    fixture.componentRef.setInput('inputs', {
      site,
      collar: deviceRecord('collar', { id: K, siteId: S, code: 'K-1', plotId: S, diameterCm: 20 }),
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

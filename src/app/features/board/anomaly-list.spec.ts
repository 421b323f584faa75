import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { FLAG_ADVICE } from '../../../../shared/flux/flag-advice';
import { rememberOnDevice, testUser } from '../../core/auth/testing/demo-sessions';
import { AnomalyList } from './anomaly-list';
import type { Anomaly } from './board-api';
import { BoardStore } from './board-store';

const settle = () => new Promise((r) => setTimeout(r, 0));

async function render(items: Anomaly[]) {
  localStorage.clear();
  rememberOnDevice(testUser(['lead']), [{ id: 'site-a', name: 'Hollow Creek Meadow', timezone: 'Pacific/Auckland' }]);
  TestBed.configureTestingModule({ imports: [AnomalyList], providers: [BoardStore, provideHttpClient(), provideHttpClientTesting()] });
  const fixture = TestBed.createComponent(AnomalyList);
  // The list is read through a resource: it stays pending (so whenStable waits) until the answer is flushed.
  TestBed.tick();
  await settle();
  TestBed.inject(HttpTestingController)
    .expectOne((r) => r.url.startsWith('/api/sites/site-a/anomalies'))
    .flush({ campaignId: null, items });
  for (let i = 0; i < 3; i++) {
    await settle();
    await fixture.whenStable();
  }
  return fixture.nativeElement as HTMLElement;
}

const flagged = (flags: string[]): Anomaly => ({
  kind: 'closure-flag',
  severity: 'warn',
  collarId: 'k1',
  collarCode: 'C7',
  recordId: 'z1',
  at: '2026-05-03T22:00:00.000Z',
  value: -0.4,
  threshold: null,
  message: 'Closure flagged: …',
  flags,
});

describe('Board anomalies: flagged closures in words', () => {
  it('when a closure is flagged, then the list says each flag in the words and advice of the shared flag table, the code only as a detail', async () => {
    const el = await render([flagged(['negative-flux', 'spike'])]);
    const rows = [...el.querySelectorAll('[data-testid="anomaly-flag"]')];
    expect(rows.map((r) => r.querySelector('.words')!.textContent!.trim())).toEqual([
      FLAG_ADVICE['negative-flux'].words,
      FLAG_ADVICE.spike.words,
    ]);
    expect(rows.map((r) => r.querySelector('.advice')!.textContent!.trim())).toEqual([
      FLAG_ADVICE['negative-flux'].advice,
      FLAG_ADVICE.spike.advice,
    ]);
    expect(rows.map((r) => r.querySelector('.flag-code')!.textContent!.trim())).toEqual(['negative-flux', 'spike']);
    // The code is a secondary detail: never the first thing the lead reads.
    expect(rows[0].textContent!.trim().startsWith(FLAG_ADVICE['negative-flux'].words)).toBe(true);
  });

  it('when the day of an anomaly is shown, then it is the site’s day, not the device’s (UTC here)', async () => {
    // 22:00 UTC on 3 May is 10:00 on 4 May in Auckland (NZST, UTC+12).
    const el = await render([flagged(['spike'])]);
    expect(el.querySelector('[data-testid="anomaly"] .at')!.textContent!.trim()).toBe('2026-05-04');
  });
});

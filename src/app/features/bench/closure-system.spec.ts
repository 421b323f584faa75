import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { TestBed } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatSelectHarness } from '@angular/material/select/testing';
import { FLAG_ADVICE } from '../../../../shared/flux';
import type { ClosureDetail } from '../../../../shared/bench/review-wire';
import { ClosureSystem } from './closure-system';
import type { Decision } from './closure-view';

const detail = {
  closure: {
    id: 'c1',
    rev: 3,
    profileId: 'short-1',
    analyzerId: 'A',
    flags: ['temp-site-default', 'start-above-ambient'],
    series: {},
    results: {
      profileName: 'Short',
      profileSource: 'closure',
      ambientPpm: 418,
      ambientAt: '2026-06-01T06:00:00.000Z',
      airTempSource: 'site-default',
      airTempC: 15,
    },
  },
  systems: {
    profiles: [
      { id: 'short-1', name: 'Short', validFrom: '2026-05-01' },
      { id: 'tall-1', name: 'Tall', validFrom: '2026-03-01' },
    ],
    analyzers: [
      { id: 'A', name: 'A', serial: 'S-1' },
      { id: 'B', name: 'B', serial: '' },
    ],
  },
  context: { timezone: 'UTC' },
} as unknown as ClosureDetail;

describe('Bench: the closure’s chamber system and flags in words', () => {
  it('shows the chamber, analyzer, ambient and temperature source, the flags in words, and sends the lab’s correction of the chamber', async () => {
    const fixture = TestBed.createComponent(ClosureSystem);
    fixture.componentRef.setInput('detail', detail);
    const sent: Decision[] = [];
    fixture.componentInstance.decide.subscribe((d) => sent.push(d));
    const loader = TestbedHarnessEnvironment.loader(fixture);
    await fixture.whenStable();
    const el = fixture.nativeElement as HTMLElement;
    const text = (sel: string) => el.querySelector(sel)?.textContent?.replace(/\s+/g, ' ').trim() ?? '';
    expect(text('[data-testid="closure-system"]')).toBe(
      'Chamber “Short” (the closure’s own chamber) · analyzer A · ambient 418 µmol/mol read 2026-06-01 06:00 UTC' +
        ' · chamber air temperature 15 °C, the site’s default (neither the file nor the visit has one)',
    );
    // The same words the phone shows (one table).
    expect(text('[data-testid="flag-words"]')).toContain(FLAG_ADVICE['temp-site-default'].words);
    expect(text('[data-testid="flag-words"]')).toContain(FLAG_ADVICE['start-above-ambient'].advice);

    const button = await loader.getHarness(MatButtonHarness.with({ text: 'Correct the chamber system' }));
    expect(await button.isDisabled()).toBe(true);
    const profile = await loader.getHarness(MatSelectHarness.with({ selector: '[data-testid="system-profile"]' }));
    await profile.open();
    await profile.clickOptions({ text: 'Tall (from 2026-03-01)' });
    await button.click();
    expect(sent).toEqual([{ fields: { profileId: 'tall-1' } }]);
  });

  it('when the ambient reading is shown, then its time reads in the site’s zone (naming it), not the device’s', async () => {
    // The device runs in UTC here; 06:00 UTC on 1 June is 18:00 in Auckland (NZST, UTC+12).
    const fixture = TestBed.createComponent(ClosureSystem);
    fixture.componentRef.setInput('detail', { ...detail, context: { timezone: 'Pacific/Auckland' } });
    await fixture.whenStable();
    expect((fixture.nativeElement as HTMLElement).querySelector('[data-testid="closure-system"]')!.textContent).toContain(
      'read 2026-06-01 18:00 NZST',
    );
  });
});

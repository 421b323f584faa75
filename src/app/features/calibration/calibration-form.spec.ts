import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { TestBed } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatFormFieldHarness } from '@angular/material/form-field/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { CalibrationForm, type CalibrationEntry } from './calibration-form';
import { fromSiteWallTime, siteWallTime } from './site-clock';

async function render(limitPct = 2, timeZone = 'Europe/Berlin') {
  TestBed.configureTestingModule({ imports: [CalibrationForm] });
  const fixture = TestBed.createComponent(CalibrationForm);
  fixture.componentRef.setInput('driftLimitPct', limitPct);
  fixture.componentRef.setInput('timeZone', timeZone);
  fixture.componentRef.setInput('recordedBy', 'Rowan Ashby');
  const saved: CalibrationEntry[] = [];
  fixture.componentInstance.save.subscribe((e) => saved.push(e));
  fixture.detectChanges();
  await fixture.whenStable();
  const loader = TestbedHarnessEnvironment.loader(fixture);
  const el = fixture.nativeElement as HTMLElement;
  const text = (id: string) => el.querySelector(`[data-testid="${id}"]`)?.textContent?.replace(/\s+/g, ' ').trim() ?? null;
  const type = async (id: string, value: string) =>
    (await loader.getHarness(MatInputHarness.with({ selector: `[data-testid="${id}"]` }))).setValue(value);
  const save = async () => (await loader.getHarness(MatButtonHarness.with({ text: 'Save calibration' }))).click();
  return { fixture, loader, saved, el, text, type, save };
}

async function fillReadings(type: (id: string, v: string) => Promise<void>, spanBefore = '1012.3', spanAfter = '1000.4') {
  await type('cal-at', '2026-07-10T08:40');
  await type('cal-zero-before', '2.4');
  await type('cal-zero-after', '0.1');
  await type('cal-span-gas', '1000');
  await type('cal-span-cylinder', ' CYL 88317 ');
  await type('cal-span-before', spanBefore);
  await type('cal-span-after', spanAfter);
}

describe('CalibrationForm', () => {
  it('when zero and span are typed, then the drift shows live and the entry saved carries the site time in UTC', async () => {
    const { saved, text, type, save } = await render();
    expect(text('cylinder-caution')).toContain("follow the supplier's handling rules");
    await fillReadings(type);
    await type('cal-note', 'Span after warm-up');
    expect(text('cal-drift')).toBe('Drift: zero +2.4, span +12.3 µmol/mol (1.23 % of the span gas; limit 2 %)');
    expect(text('cal-drift-verdict')).toBe('Drift within the site limit.');
    expect(text('cal-left')).toBe('Left within the limit after adjustment.');
    await save();
    // 08:40 in Berlin in July is UTC+2 (EU summer time, Directive 2000/84/EC).
    expect(saved).toEqual([
      {
        at: '2026-07-10T06:40:00.000Z',
        zeroGasPpm: 0,
        zeroCylinder: null,
        zeroBeforePpm: 2.4,
        zeroAfterPpm: 0.1,
        spanGasPpm: 1000,
        spanCylinder: 'CYL 88317',
        spanBeforePpm: 1012.3,
        spanAfterPpm: 1000.4,
        passed: true,
        note: 'Span after warm-up',
      },
    ]);
  });

  it('when the span was found 35 µmol/mol off a 1000 µmol/mol gas, then the form says it is over the 2 % site limit', async () => {
    const { text, type } = await render();
    await fillReadings(type, '1035', '1030');
    expect(text('cal-drift-verdict')).toBe(
      'Drift over the site limit: the lead sees it on the Board; fluxes since the last calibration need a look.',
    );
    expect(text('cal-left')).toBe('Not left within the limit: adjust again, or record it and tell the lead.');
  });

  it('when readings, the span gas or its cylinder are missing, then nothing is saved and each field says what it needs', async () => {
    const { saved, loader, type, save } = await render();
    await type('cal-span-gas', '0');
    await save();
    expect(saved).toEqual([]);
    const errors = await Promise.all((await loader.getAllHarnesses(MatFormFieldHarness)).map((f) => f.getTextErrors()));
    expect(errors.flat()).toEqual(expect.arrayContaining(['Certified value, above 0', 'The id on its label', 'Reading before adjusting']));
  });

  it('when the form opens, then the time field shows now on the site clock', async () => {
    const { el } = await render(2, 'America/Chicago');
    const shown = el.querySelector<HTMLInputElement>('[data-testid="cal-at"]')!.value;
    const back = fromSiteWallTime(shown, 'America/Chicago');
    expect(back.ok && Math.abs(Date.parse(back.iso) - Date.now())).toBeLessThan(120_000);
  });
});

describe('site clock', () => {
  it('when a wall time is read in the site zone, then it round-trips; a skipped spring hour is refused', () => {
    expect(siteWallTime('2026-07-10T06:40:00Z', 'Europe/Berlin')).toBe('2026-07-10T08:40');
    expect(fromSiteWallTime('2026-01-10T08:40', 'Europe/Berlin')).toEqual({ ok: true, iso: '2026-01-10T07:40:00.000Z' });
    // Europe/Berlin skips 02:00–03:00 on 29 March 2026 (last Sunday of March, Directive 2000/84/EC).
    expect(fromSiteWallTime('2026-03-29T02:30', 'Europe/Berlin').ok).toBe(false);
  });
});

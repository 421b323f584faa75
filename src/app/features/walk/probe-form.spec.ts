import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { signal } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { MatRadioGroupHarness } from '@angular/material/radio/testing';
import type { MoistureCalibration } from '../../../../shared/model/derived';
import { AuthStore } from '../../core/auth/auth-store';
import { AUTOSAVE_MS } from './offset-form';
import { ProbeForm, type ProbeRecord, type ProbeSave } from './probe-form';

const pause = (ms: number) => new Promise((r) => setTimeout(r, ms));
const ME = 'a0000000-0000-4000-8000-000000000001';

async function render(
  calibration: MoistureCalibration,
  savedRecord: ProbeRecord | null = null,
  replicates: ProbeRecord[] = savedRecord ? [savedRecord] : [],
  tolerance = 1,
) {
  TestBed.configureTestingModule({ imports: [ProbeForm], providers: [{ provide: AuthStore, useValue: { user: signal({ id: ME }) } }] });
  const fixture = TestBed.createComponent(ProbeForm);
  fixture.componentRef.setInput('calibration', calibration);
  fixture.componentRef.setInput('saved', savedRecord);
  fixture.componentRef.setInput('replicates', replicates);
  fixture.componentRef.setInput('zone', 'Europe/Zurich');
  fixture.componentRef.setInput('depthToleranceCm', tolerance);
  fixture.componentRef.setInput('kit', { probeId: 'TDR-2', rodLengthCm: 12, moistureKind: 'vwc' });
  const loader = TestbedHarnessEnvironment.loader(fixture);
  const saved: ProbeSave[] = [];
  const removed: string[] = [];
  fixture.componentInstance.save.subscribe((v) => saved.push(v));
  fixture.componentInstance.removeReplicate.subscribe((id) => removed.push(id));
  await fixture.whenStable();
  const el = fixture.nativeElement as HTMLElement;
  const shown = () => el.querySelector('[data-testid="moisture-vwc"]')?.textContent?.trim() ?? null;
  const testid = (id: string) => el.querySelector(`[data-testid="${id}"]`)?.textContent?.replace(/\s+/g, ' ').trim() ?? null;
  const moisture = () => loader.getHarness(MatInputHarness.with({ selector: '[data-testid="moisture-raw"]' }));
  const soilTemp = () => loader.getHarness(MatInputHarness.with({ selector: '[data-testid="soil-temp-1"]' }));
  /** The stored replicates as the live query would hand them back after the saves. */
  const storeSaves = async (base: ProbeRecord[]) => {
    const byId = new Map(base.map((r) => [r.id, r]));
    for (const s of saved)
      byId.set(s.id, { ...(byId.get(s.id) ?? { takenAt: '2026-06-01T08:30:00Z', takenById: ME }), ...s.reading, id: s.id });
    const list = [...byId.values()];
    fixture.componentRef.setInput('replicates', list);
    fixture.componentRef.setInput('saved', list[list.length - 1]);
    await fixture.whenStable();
  };
  return { fixture, loader, saved, removed, shown, testid, moisture, soilTemp, storeSaves };
}

const first: ProbeRecord = {
  id: 'p1',
  rev: 1,
  siteId: '11111111-1111-4111-8111-111111111111',
  visitId: '66666666-6666-4666-8666-666666666666',
  collarId: '33333333-3333-4333-8333-333333333333',
  campaignId: '44444444-4444-4444-8444-444444444444',
  takenAt: '2026-06-01T08:10:00Z',
  takenById: ME,
  soilTemps: [{ depthCm: 5, tempC: 7.5 }],
  moistureRaw: 23.4,
  moistureKind: 'vwc',
  rodLengthCm: 20,
  probeId: 'TDR-9',
};

describe('ProbeForm moisture display', () => {
  it('when permittivity is entered with the Topp calibration, then the VWC from Topp et al. (1980) is shown', async () => {
    const { loader, shown, moisture } = await render({ kind: 'topp' });
    await (await loader.getHarness(MatRadioGroupHarness)).checkRadioButton({ label: 'Permittivity (Ka)' });
    await (await moisture()).setValue('20');
    // Topp, Davis & Annan (1980) Water Resour. Res. 16:574, θ = −0.053 + 0.0292 Ka − 5.5e−4 Ka² + 4.3e−6 Ka³.
    // By hand at Ka = 20: −0.053 + 0.584 − 0.220 + 0.0344 = 0.3454 → 34.5 %.
    expect(shown()).toBe('= 34.5 % VWC (Topp et al. 1980)');
    await (await moisture()).setValue('10');
    // Ka = 10: −0.053 + 0.292 − 0.055 + 0.0043 = 0.1883 → 18.8 %.
    expect(shown()).toBe('= 18.8 % VWC (Topp et al. 1980)');
  });

  it('when the site has its own polynomial, then permittivity goes through it instead', async () => {
    const { loader, shown, moisture } = await render({ kind: 'polynomial', coefficients: [0.1, 0.01], validMin: null, validMax: null });
    await (await loader.getHarness(MatRadioGroupHarness)).checkRadioButton({ label: 'Permittivity (Ka)' });
    await (await moisture()).setValue('20');
    // 0.1 + 0.01·20 = 0.30 → 30.0 %.
    expect(shown()).toBe('= 30.0 % VWC (the site calibration)');
  });

  it('when moisture is read as VWC, then no conversion is shown and the value is saved as VWC with the probe kit, once, under one new id', async () => {
    const { saved, shown, moisture, soilTemp } = await render({ kind: 'topp' });
    await (await moisture()).setValue('23.5');
    expect(shown()).toBeNull();
    await (await soilTemp()).setValue('6.4');
    // No Save button: the reading saves itself after a pause, once.
    await pause(AUTOSAVE_MS + 150);
    expect(saved).toEqual([
      {
        id: expect.stringMatching(/^[0-9a-f-]{36}$/),
        reading: { soilTemps: [{ depthCm: 5, tempC: 6.4 }], moistureRaw: 23.5, moistureKind: 'vwc', rodLengthCm: 12, probeId: 'TDR-2' },
      },
    ]);
  });

  it('when the visit is opened again, then the saved reading is what the section shows, and Change puts it back in the boxes', async () => {
    const { loader, testid, moisture } = await render(
      { kind: 'topp' },
      { ...first, moistureRaw: 18, moistureKind: 'permittivity', soilTemps: [{ depthCm: 10, tempC: 7.5 }] },
    );
    expect(testid('probe-saved')).toContain('Saved: 7.5 °C at 10 cm · Ka 18');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Change' }))).click();
    expect(await (await moisture()).getValue()).toBe('18');
    expect(await (await loader.getHarness(MatInputHarness.with({ selector: '[data-testid="soil-temp-1"]' }))).getValue()).toBe('7.5');
    expect(await (await loader.getHarness(MatInputHarness.with({ selector: '[formcontrolname="probeId"]' }))).getValue()).toBe('TDR-9');
    expect(await (await loader.getHarness(MatRadioGroupHarness)).getCheckedValue()).toBe('permittivity');
  });
  it('when the visit is opened with a stored reading, then nothing is saved again, whatever the order of its stored fields', async () => {
    // A record from the server or the device store may list a depth's fields in another order.
    const stored: ProbeRecord = { ...first, moistureRaw: 22, moistureKind: 'vwc', soilTemps: [{ tempC: 7.5, depthCm: 10 }] };
    const { saved } = await render({ kind: 'topp' }, stored);
    await pause(AUTOSAVE_MS + 300);
    expect(saved).toEqual([]);
  });
});

describe('ProbeForm replicates', () => {
  it('when a visit has three replicates, then each is listed with its site time and taker, and count, mean and sample SD are shown', async () => {
    const reps: ProbeRecord[] = [
      first,
      {
        ...first,
        id: 'p2',
        takenAt: '2026-06-01T08:10:30Z',
        moistureRaw: 25.1,
        soilTemps: [{ depthCm: 5, tempC: 7.7 }],
        takenById: 'b0000000-0000-4000-8000-000000000002',
      },
      { ...first, id: 'p3', takenAt: '2026-06-01T08:11:00Z', moistureRaw: 24.0, soilTemps: [{ depthCm: 5, tempC: 7.9 }] },
    ];
    const { testid } = await render({ kind: 'topp' }, reps[2], reps);
    // 23.4, 25.1, 24.0: mean 24.17, sample SD 0.862 (statistics.stdev); 7.5, 7.7, 7.9: mean 7.7, SD 0.2.
    expect(testid('probe-stats')).toBe('3 replicates · VWC mean 24.2 %, SD 0.9 (n = 3) · soil 7.7 °C at 5 cm, SD 0.2 (n = 3)');
    // 08:10 UTC is 10:10 in Zurich in June (CEST).
    expect(testid('replicate-1')).toMatch(/^1 · 10:10 \S+ · 23\.4 % VWC · 7\.5 °C at 5 cm · you/);
    expect(testid('replicate-2')).toContain('· another member');
    expect(testid('probe-off-depth')).toBeNull();
  });

  it('when another replicate is added, then one tap and one typed value save it under a new id and the first is never sent again', async () => {
    const { fixture, loader, saved, testid, moisture, storeSaves } = await render({ kind: 'topp' }, first);
    expect(testid('probe-stats')).toBe('1 replicate · VWC mean 23.4 % (n = 1) · soil 7.5 °C at 5 cm (n = 1)');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Add a replicate' }))).click();
    expect(await (await moisture()).getValue()).toBe('');
    await (await moisture()).setValue('25.1');
    await pause(AUTOSAVE_MS + 150);
    expect(saved).toEqual([
      {
        id: expect.not.stringMatching(/^p1$/),
        reading: { soilTemps: [], moistureRaw: 25.1, moistureKind: 'vwc', rodLengthCm: 20, probeId: 'TDR-9' },
      },
    ]);
    await storeSaves([first]);
    // A correction while the boxes still hold it goes to the same new replicate.
    await (await moisture()).setValue('25.3');
    await pause(AUTOSAVE_MS + 150);
    expect(saved.length).toBe(2);
    expect(saved[1]).toEqual({ id: saved[0].id, reading: expect.objectContaining({ moistureRaw: 25.3 }) });
    await storeSaves([first]);
    // And a third in one tap and one value.
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Add a replicate' }))).click();
    await (await moisture()).setValue('24');
    await pause(AUTOSAVE_MS + 150);
    expect(saved.length).toBe(3);
    expect(new Set(saved.map((s) => s.id)).size).toBe(2);
    expect(saved.some((s) => s.id === 'p1')).toBe(false);
    await storeSaves([first]);
    expect(testid('probe-stats')).toMatch(/^3 replicates · VWC mean 24\.2 %, SD 1\.0 \(n = 3\)/);
    fixture.destroy();
  });

  it('when a replicate is deleted, then it takes a second tap and only its id is sent', async () => {
    const reps = [first, { ...first, id: 'p2', moistureRaw: 99 }];
    const { loader, removed } = await render({ kind: 'topp' }, reps[1], reps);
    await (await loader.getHarness(MatButtonHarness.with({ selector: '[aria-label="Delete replicate 2"]' }))).click();
    expect(removed).toEqual([]);
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Delete replicate 2' }))).click();
    expect(removed).toEqual(['p2']);
  });

  it('when a temperature is more than ±1 cm off the site probe depth, then it is flagged and not in the mean', async () => {
    const reps = [first, { ...first, id: 'p2', soilTemps: [{ depthCm: 10, tempC: 4 }] }];
    const { testid } = await render({ kind: 'topp' }, reps[1], reps);
    expect(testid('probe-stats')).toContain('soil 7.5 °C at 5 cm (n = 1)');
    expect(testid('probe-off-depth')).toContain("1 temperature was taken more than ±1 cm from the site's 5 cm probe depth");
    expect(testid('replicate-2')).toContain('4 °C at 10 cm (off depth)');
  });

  it('when the site allows ±2 cm, then a temperature 1.5 cm off counts in the mean and the warning names ±2 cm', async () => {
    const reps = [
      first,
      { ...first, id: 'p2', soilTemps: [{ depthCm: 6.5, tempC: 9.5 }] },
      { ...first, id: 'p3', soilTemps: [{ depthCm: 8, tempC: 4 }] },
    ];
    const { testid } = await render({ kind: 'topp' }, reps[2], reps, 2);
    expect(testid('probe-stats')).toContain('soil 8.5 °C at 5 cm, SD 1.4 (n = 2)');
    expect(testid('probe-off-depth')).toContain("1 temperature was taken more than ±2 cm from the site's 5 cm probe depth");
    expect(testid('replicate-2')).not.toContain('off depth');
    expect(testid('replicate-3')).toContain('4 °C at 8 cm (off depth)');
  });
});

describe('ProbeForm bad input', () => {
  it.each([
    ['150', 'VWC must be between 0 and 100 %'],
    ['wet', 'Moisture must be a number in % VWC (e.g. 23.5).'],
    ['0.23 m3/m3', 'Moisture is in % VWC (e.g. 23.5); "m3/m3" is another unit.'],
  ])('when moisture "%s" is typed, then "%s" shows and nothing is saved over the stored replicate', async (typed, message) => {
    const { loader, saved, testid, moisture } = await render({ kind: 'topp' }, first);
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Change' }))).click();
    await (await moisture()).setValue(typed);
    await pause(AUTOSAVE_MS + 150);
    expect(testid('probe-problem')).toBe(message);
    expect(saved).toEqual([]);
  });

  it('when a soil temperature is given in °F, then the box says it is in °C; "23 %" is a VWC as typed', async () => {
    const { saved, testid, moisture, soilTemp } = await render({ kind: 'topp' });
    await (await soilTemp()).setValue('75 F');
    await pause(AUTOSAVE_MS + 150);
    expect(testid('probe-problem')).toBe('Soil temperature is in °C; "F" is another unit.');
    await (await soilTemp()).setValue('12.5 °C');
    await (await moisture()).setValue('23 %');
    await pause(AUTOSAVE_MS + 150);
    expect(testid('probe-problem')).toBeNull();
    expect(saved.map((s) => [s.reading.soilTemps, s.reading.moistureRaw])).toEqual([[[{ depthCm: 5, tempC: 12.5 }], 23]]);
  });
});

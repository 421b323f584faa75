import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { TestBed } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { MatRadioGroupHarness } from '@angular/material/radio/testing';
import type { MoistureCalibration } from '../../../../shared/model/derived';
import { AUTOSAVE_MS } from './offset-form';
import { ProbeForm, type ProbeReadingInput } from './probe-form';

const pause = (ms: number) => new Promise((r) => setTimeout(r, ms));

async function render(calibration: MoistureCalibration, savedRecord: Record<string, unknown> | null = null) {
  TestBed.configureTestingModule({ imports: [ProbeForm] });
  const fixture = TestBed.createComponent(ProbeForm);
  fixture.componentRef.setInput('calibration', calibration);
  fixture.componentRef.setInput('saved', savedRecord);
  fixture.componentRef.setInput('kit', { probeId: 'TDR-2', rodLengthCm: 12, moistureKind: 'vwc' });
  const loader = TestbedHarnessEnvironment.loader(fixture);
  const saved: ProbeReadingInput[] = [];
  fixture.componentInstance.save.subscribe((v) => saved.push(v));
  await fixture.whenStable();
  const shown = () => (fixture.nativeElement as HTMLElement).querySelector('[data-testid="moisture-vwc"]')?.textContent?.trim() ?? null;
  const moisture = () => loader.getHarness(MatInputHarness.with({ selector: '[data-testid="moisture-raw"]' }));
  return { fixture, loader, saved, shown, moisture };
}

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

  it('when moisture is read as VWC, then no conversion is shown and the value is saved as VWC with the probe kit', async () => {
    const { loader, saved, shown, moisture } = await render({ kind: 'topp' });
    await (await moisture()).setValue('23.5');
    expect(shown()).toBeNull();
    await (await loader.getHarness(MatInputHarness.with({ selector: '[data-testid="soil-temp-1"]' }))).setValue('6.4');
    // No Save button: the reading saves itself after a pause, once.
    await pause(AUTOSAVE_MS + 150);
    expect(saved).toEqual([{ soilTemps: [{ depthCm: 5, tempC: 6.4 }], moistureRaw: 23.5, moistureKind: 'vwc', rodLengthCm: 12, probeId: 'TDR-2' }]);
  });

  it('when the visit is opened again, then the saved reading is what the section shows, and Change puts it back in the boxes', async () => {
    const { fixture, loader, moisture } = await render({ kind: 'topp' }, {
      id: 'p1', soilTemps: [{ depthCm: 10, tempC: 7.5 }], moistureRaw: 18, moistureKind: 'permittivity', rodLengthCm: 20, probeId: 'TDR-9',
    });
    const el = fixture.nativeElement as HTMLElement;
    expect(el.querySelector('[data-testid="probe-saved"]')?.textContent).toContain('Saved: 7.5 °C at 10 cm · Ka 18');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Change' }))).click();
    expect(await (await moisture()).getValue()).toBe('18');
    expect(await (await loader.getHarness(MatInputHarness.with({ selector: '[data-testid="soil-temp-1"]' }))).getValue()).toBe('7.5');
    expect(await (await loader.getHarness(MatInputHarness.with({ placeholder: '' , selector: '[formcontrolname="probeId"]' }))).getValue()).toBe('TDR-9');
    expect(await (await loader.getHarness(MatRadioGroupHarness)).getCheckedValue()).toBe('permittivity');
  });
});

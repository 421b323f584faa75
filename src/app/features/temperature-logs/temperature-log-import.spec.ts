import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { signal } from '@angular/core';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { TestBed } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatButtonToggleHarness } from '@angular/material/button-toggle/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { MatSelectHarness } from '@angular/material/select/testing';
import { provideRouter } from '@angular/router';
import { SiteChoice } from '../../core/auth/site-choice';
import { TemperatureLogApi } from './temperature-log-api';
import { TemperatureLogImport } from './temperature-log-import';

const SITE = { id: 'site-1', name: 'Hainich', timezone: 'Europe/Berlin' };
const PLOTS = [
  { id: 'p-1', code: 'A1' },
  { id: 'p-2', code: 'A2' },
  { id: 'p-3', code: 'B1' },
];

async function setup() {
  const importLog = jest.fn().mockResolvedValue({
    id: 'log-1',
    mode: 'replace',
    dryRun: false,
    samples: 3,
    from: null,
    to: null,
    plots: [
      { plotId: 'p-1', logId: 'log-1', samples: 3, skipped: 0, replacedSamples: 2, touchedLogs: [] },
      { plotId: 'p-3', logId: 'log-2', samples: 3, skipped: 0, replacedSamples: 0, touchedLogs: [] },
    ],
  });
  TestBed.configureTestingModule({
    imports: [TemperatureLogImport],
    providers: [
      provideHttpClient(),
      provideHttpClientTesting(),
      provideRouter([]),
      { provide: SiteChoice, useValue: { current: signal(SITE) } },
      { provide: TemperatureLogApi, useValue: { importLog } },
    ],
  });
  const fixture = TestBed.createComponent(TemperatureLogImport);
  fixture.detectChanges();
  TestBed.inject(HttpTestingController).expectOne('/api/plots?siteId=site-1&limit=500').flush({ items: PLOTS });
  await fixture.whenStable();
  const loader = TestbedHarnessEnvironment.loader(fixture);
  const el = fixture.nativeElement as HTMLElement;
  return {
    fixture,
    loader,
    el,
    importLog,
    component: fixture.componentInstance as unknown as { useText(n: string, t: string): Promise<void> },
  };
}

describe('TemperatureLogImport', () => {
  it('when a file has a bad line, then the preview names it and nothing can be sent', async () => {
    const { fixture, loader, el, component } = await setup();
    await component.useText('soil.csv', 'Datum;Bodentemperatur 10 cm\n2026-07-01 00:00;14,2\n2026-07-01 01:00;--\n2026-03-29 02:30;9,1\n');
    fixture.detectChanges();
    await fixture.whenStable();
    const errors = el.querySelector('[data-testid="line-errors"]')!.textContent!;
    expect(errors).toContain('Line 3: "--" is not a temperature');
    // 02:30 on 29 March 2026 never happens in Berlin (clocks jump from 02:00 to 03:00).
    expect(errors).toContain('Line 4:');
    expect(errors).toContain('does not exist in Europe/Berlin');
    expect(await (await loader.getHarness(MatButtonHarness.with({ text: 'Import' }))).isDisabled()).toBe(true);
  });

  it('when the lab maps the columns, picks plots, depth and replace, then the import sends exactly that and shows times in the site zone', async () => {
    const { fixture, loader, el, importLog, component } = await setup();
    const text = 'Zeit\tLogger intern\tT soil\n2026-07-01 00:00\t30.0\t14.2\n2026-07-01 01:00\t30.1\t14.0\n2026-07-01 02:00\t30.2\t13.9\n';
    await component.useText('logger-7.txt', text);
    fixture.detectChanges();
    const selects = await loader.getAllHarnesses(MatSelectHarness);
    expect(await selects[0].getValueText()).toBe('Zeit');
    await selects[2].clickOptions({ text: 'T soil' });
    await (await loader.getHarness(MatInputHarness.with({ selector: '[formControlName="depthCm"]' }))).setValue('10');
    const plots = selects[3];
    expect(await plots.isMultiple()).toBe(true);
    await plots.clickOptions({ text: 'A1' });
    await plots.clickOptions({ text: 'B1' });
    await plots.close();
    await (await loader.getHarness(MatButtonToggleHarness.with({ text: /^Replace/ }))).check();
    const summary = el.querySelector('[data-testid="preview-summary"]')!.textContent!;
    // Berlin is UTC+2 in July (CEST): the file's local times are shown as written, naming the zone.
    expect(summary).toContain('3 readings');
    expect(summary).toContain('2026-07-01 00:00 CEST');
    expect(summary).toContain('2026-07-01 02:00 CEST');
    const send = await loader.getHarness(MatButtonHarness.with({ text: 'Import' }));
    expect(await send.isDisabled()).toBe(false);
    await send.click();
    await fixture.whenStable();
    expect(importLog).toHaveBeenCalledWith({
      siteId: 'site-1',
      plotIds: ['p-1', 'p-3'],
      depthCm: 10,
      source: 'logger-7.txt',
      text,
      timeColumn: 'Zeit',
      tempColumn: 'T soil',
      timeZone: 'Europe/Berlin',
      timeFormat: undefined,
      mode: 'replace',
      dryRun: false,
    });
    fixture.detectChanges();
    const outcome = el.querySelector('[data-testid="outcome"]')!.textContent!;
    expect(outcome).toContain('Plot A1: 3');
    expect(outcome).toContain('2 stored readings replaced');
    expect(outcome).toContain('Plot B1: 3');
  });

  it('when no plot is chosen, then the import stays disabled', async () => {
    const { fixture, loader, component } = await setup();
    await component.useText('x.csv', 'time,temp\n2026-07-01T00:00:00Z,12.5\n');
    fixture.detectChanges();
    await (await loader.getHarness(MatInputHarness.with({ selector: '[formControlName="depthCm"]' }))).setValue('5');
    expect(await (await loader.getHarness(MatButtonHarness.with({ text: 'Import' }))).isDisabled()).toBe(true);
  });
});

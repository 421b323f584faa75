import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { TestBed } from '@angular/core/testing';
import { MatSelectHarness } from '@angular/material/select/testing';
import { SiteForm } from './site-form';

const SITE = {
  id: '0b5e7d2c-1111-4a4a-8a8a-000000000001',
  rev: 3,
  name: 'Alder test',
  timezone: 'Europe/Berlin',
  elevationM: 300,
  latitude: null,
  longitude: null,
  safetyNote: '',
  moistureCalibration: { kind: 'topp' },
  tempDepthCm: 5,
  settlingDaysHard: 1,
  settlingDaysWarn: 7,
  offsetSpreadPct: 3,
  offsetMoveCm: 1,
  leakSlopeUmolMolS: 0.05,
  ambientMarginPpm: 100,
  defaultAirTempC: 15,
  digestLocalTime: '18:00',
  tileUrl: null,
  tileAttribution: null,
};

async function formOf(site: Record<string, unknown>) {
  TestBed.configureTestingModule({ imports: [SiteForm], providers: [provideHttpClient(), provideHttpClientTesting()] });
  const fixture = TestBed.createComponent(SiteForm);
  fixture.componentRef.setInput('site', site);
  fixture.detectChanges();
  await fixture.whenStable();
  const loader = TestbedHarnessEnvironment.loader(fixture);
  return { fixture, loader, backend: TestBed.inject(HttpTestingController) };
}

describe('SiteForm: slope basis', () => {
  it('when a site has no basis yet, then chamber closure is shown; choosing the settle end sends slopeBasis settle_end', async () => {
    const { fixture, loader, backend } = await formOf(SITE);
    const select = await loader.getHarness(MatSelectHarness.with({ selector: '[data-testid="slope-basis"]' }));
    expect(await select.getValueText()).toBe('Chamber closure (t = 0, default)');
    await select.open();
    await select.clickOptions({ text: 'End of the settle time' });
    (fixture.nativeElement as HTMLElement).querySelector('form')!.dispatchEvent(new Event('submit'));
    const req = backend.expectOne((r) => r.url === `/api/sites/${SITE.id}`);
    expect(req.request.method).toBe('PATCH');
    expect(req.request.body).toMatchObject({ rev: 3, slopeBasis: 'settle_end' });
  });

  it('when a site stores the settle-end basis, then the select shows it', async () => {
    const { loader } = await formOf({ ...SITE, slopeBasis: 'settle_end' });
    const select = await loader.getHarness(MatSelectHarness.with({ selector: '[data-testid="slope-basis"]' }));
    expect(await select.getValueText()).toBe('End of the settle time');
  });
});

describe('SiteForm: soil temperature depth tolerance', () => {
  const field = (el: HTMLElement) =>
    [...el.querySelectorAll('mat-form-field')].find((f) => f.textContent?.includes('Soil temperature depth tolerance'))!;

  it('when a site has none stored, then ±1 cm is shown beside the depth with its hint; typing 2 sends tempDepthToleranceCm 2', async () => {
    const { fixture, backend } = await formOf(SITE);
    const el = fixture.nativeElement as HTMLElement;
    const input = field(el).querySelector('input')!;
    expect(input.value).toBe('1');
    expect(field(el).textContent).toContain('left out of the visit mean (0–10 cm)');
    input.value = '2';
    input.dispatchEvent(new Event('input'));
    el.querySelector('form')!.dispatchEvent(new Event('submit'));
    const req = backend.expectOne((r) => r.url === `/api/sites/${SITE.id}`);
    expect(req.request.body).toMatchObject({ rev: 3, tempDepthToleranceCm: 2 });
  });

  it('when 12 cm is typed, then the range message shows and nothing is sent', async () => {
    const { fixture, backend } = await formOf({ ...SITE, tempDepthToleranceCm: 1.5 });
    const el = fixture.nativeElement as HTMLElement;
    const input = field(el).querySelector('input')!;
    expect(input.value).toBe('1.5');
    input.value = '12';
    input.dispatchEvent(new Event('input'));
    el.querySelector('form')!.dispatchEvent(new Event('submit'));
    fixture.detectChanges();
    await fixture.whenStable();
    expect(field(el).textContent).toContain('Temperature depth tolerance must be at most 10 cm');
    backend.expectNone((r) => r.url === `/api/sites/${SITE.id}`);
  });
});

describe('SiteForm: values the person leaves alone', () => {
  const fieldNamed = (el: HTMLElement, label: string) =>
    [...el.querySelectorAll('mat-form-field')].find((f) => f.querySelector('mat-label')?.textContent?.trim().startsWith(label))!;

  it('when a new site is made, then the fields start at the shared schema defaults and those are what is sent', async () => {
    TestBed.configureTestingModule({ imports: [SiteForm], providers: [provideHttpClient(), provideHttpClientTesting()] });
    const fixture = TestBed.createComponent(SiteForm);
    fixture.detectChanges();
    await fixture.whenStable();
    const el = fixture.nativeElement as HTMLElement;
    const input = (label: string) => fieldNamed(el, label).querySelector('input')!;
    // Defaults of siteFields (shared/model/site-layout.ts): 5 cm depth, ±1 cm, digest at 18:00.
    expect([input('Soil temperature depth for responses').value, input('Daily digest').value]).toEqual(['5', '18:00']);
    for (const [label, value] of [
      ['Site name', 'Fen edge'],
      ['Time zone', 'Europe/Berlin'],
      ['Elevation', '120'],
    ]) {
      input(label!).value = value!;
      input(label!).dispatchEvent(new Event('input'));
    }
    el.querySelector('form')!.dispatchEvent(new Event('submit'));
    const req = TestBed.inject(HttpTestingController).expectOne((r) => r.url === '/api/sites');
    expect(req.request.method).toBe('POST');
    expect(req.request.body).toMatchObject({
      name: 'Fen edge',
      timezone: 'Europe/Berlin',
      elevationM: 120,
      latitude: null,
      tempDepthCm: 5,
      tempDepthToleranceCm: 1,
      settlingDaysWarn: 7,
      digestLocalTime: '18:00',
      slopeBasis: 'closure',
      moistureCalibration: { kind: 'topp' },
      tileUrl: null,
    });
  });

  it('when a threshold is emptied, then it is left out of the edit (the stored value stays) and an emptied latitude is sent as none', async () => {
    const { fixture, backend } = await formOf({ ...SITE, latitude: 50.9, settlingDaysWarn: 10 });
    const el = fixture.nativeElement as HTMLElement;
    for (const label of ['Settling days (warn before)', 'Latitude']) {
      const input = fieldNamed(el, label).querySelector('input')!;
      input.value = '';
      input.dispatchEvent(new Event('input'));
    }
    el.querySelector('form')!.dispatchEvent(new Event('submit'));
    // As sent over the wire (JSON), where a field without a value is left out.
    const body: unknown = JSON.parse(JSON.stringify(backend.expectOne((r) => r.url === `/api/sites/${SITE.id}`).request.body));
    expect(body).not.toHaveProperty('settlingDaysWarn');
    expect(body).toMatchObject({ rev: 3, latitude: null, settlingDaysHard: 1 });
  });
});

import { provideHttpClient } from '@angular/common/http';

// The visit screen hosts the closure panel, whose logger reader starts a module Web Worker via
// import.meta (not loadable under CommonJS jest); nothing here reads logger files.
jest.mock('../closures/logger-reader', () => ({ readLoggerFile: jest.fn() }));
import { provideHttpClientTesting } from '@angular/common/http/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { TestBed } from '@angular/core/testing';
import { MatFormFieldHarness } from '@angular/material/form-field/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { provideRouter } from '@angular/router';
import type { FluxDb } from '../../core/db/db-schema';
import { DeviceDb } from '../../core/db/device-db';
import { until } from '../../core/db/testing/until';
import { parseAirTemp } from './air-temp-field';
import { VisitPage } from './visit-page';
import { WalkContext } from '../field-day/walk-context';

const SITE = '11111111-1111-4111-8111-111111111111';
const PLOT = '22222222-2222-4222-8222-222222222222';
const COLLAR = '33333333-3333-4333-8333-333333333333';
const CAMPAIGN = '44444444-4444-4444-8444-444444444444';
const VISIT = '66666666-6666-4666-8666-666666666666';

describe('Air temperature at the visit', () => {
  afterEach(() => localStorage.clear());

  it('reads decimal commas and refuses values outside −40…60 °C', () => {
    expect(parseAirTemp('12,5')).toBe(12.5);
    expect(parseAirTemp(' -3 ')).toBe(-3);
    expect(parseAirTemp('')).toBeNull();
    expect(parseAirTemp('warm')).toBeUndefined();
    expect(parseAirTemp('75')).toBeUndefined();
  });

  async function openVisit(userNo: string, visit?: Record<string, unknown>) {
    localStorage.setItem(
      'fw.session',
      JSON.stringify({
        user: {
          id: `0000000${userNo}-0000-4000-8000-0000000000ae`,
          email: 'crew@fluxwalk.example',
          displayName: 'Crew',
          roles: ['crew'],
          siteIds: [SITE],
        },
        sites: [{ id: SITE, name: 'Test site' }],
      }),
    );
    TestBed.configureTestingModule({ providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting()] });
    const db: FluxDb = await until(() => TestBed.inject(DeviceDb).db(), 'the database');
    await db
      .records('site')
      .put({ id: SITE, rev: 1, name: 'Test site', offsetSpreadPct: 3, offsetMoveCm: 1, moistureCalibration: { kind: 'topp' } });
    await db.records('plot').put({ id: PLOT, rev: 1, siteId: SITE, code: 'P1' });
    await db
      .records('collar')
      .put({ id: COLLAR, rev: 1, siteId: SITE, plotId: PLOT, code: 'W-03', shape: 'round', diameterCm: 20, status: 'active' });
    await db.records('campaign').put({ id: CAMPAIGN, rev: 1, siteId: SITE, name: 'Dec', rounds: 2, routes: [] });
    if (visit) await db.records('visit').put(visit as never);
    TestBed.inject(WalkContext).update({ campaignId: CAMPAIGN, round: 1 });
    const fixture = TestBed.createComponent(VisitPage);
    fixture.componentRef.setInput('collarId', COLLAR);
    const loader = TestbedHarnessEnvironment.loader(fixture);
    const el = fixture.nativeElement as HTMLElement;
    await until(() => el.querySelector('[data-testid="visit-code"]')?.textContent === 'W-03', 'the collar');
    return { db, fixture, loader };
  }

  it('when the crew types the air temperature and saves the conditions, then the visit on the device carries it and it is queued for sync', async () => {
    const { db, fixture, loader } = await openVisit('1');

    const box = await loader.getHarness(MatInputHarness.with({ selector: '[data-testid="air-temp"]' }));
    await box.setValue('95');
    await box.blur();
    const field = await loader.getHarness(MatFormFieldHarness.with({ floatingLabelText: 'Air temperature (°C)' }));
    expect(await field.getTextErrors()).toEqual(['Enter a temperature from −40 to 60 °C, e.g. 12,5']);
    await box.setValue('12,5');
    expect(await field.getTextErrors()).toEqual([]);
    // No Save button: the conditions save themselves after a short pause.
    const [visit] = await until(async () => {
      const v = await db.records('visit').toArray();
      return v.length ? v : null;
    }, 'the visit');
    expect(visit.conditions.airTempC).toBe(12.5);
    const ops = await db.outbox.toArray();
    expect(ops.some((o) => o.entity === 'visit' && (o.fields['conditions'] as { airTempC?: number } | undefined)?.airTempC === 12.5)).toBe(
      true,
    );
    fixture.destroy();
  });

  it('when a visit with an air temperature is opened again, then the box shows it, and a corrected value typed with a comma stays as typed after it saves', async () => {
    const conditions = {
      rainNow: false,
      rain24h: false,
      standingWater: false,
      frostSnow: false,
      trampled: false,
      animal: false,
      other: '',
    };
    const stored = {
      id: VISIT,
      rev: 1,
      siteId: SITE,
      campaignId: CAMPAIGN,
      round: 1,
      collarId: COLLAR,
      crewId: null,
      arrivedAt: '2026-12-03T08:00:00Z',
      skipped: false,
      skipReason: null,
    };
    const { db, fixture, loader } = await openVisit('2', { ...stored, conditions: { ...conditions, airTempC: 8.5 } });
    const box = await loader.getHarness(MatInputHarness.with({ selector: '[data-testid="air-temp"]' }));
    await until(async () => (await box.getValue()) === '8.5', 'the stored air temperature in the box');
    await box.setValue('9,5');
    await until(async () => (await db.records('visit').get(VISIT))?.conditions.airTempC === 9.5, 'the corrected air temperature stored');
    fixture.detectChanges();
    await fixture.whenStable();
    expect(await box.getValue()).toBe('9,5');
    fixture.destroy();
  });
});

// The logger reader starts a module Web Worker via import.meta (not loadable under CommonJS jest);
// nothing here reads a logger file.
jest.mock('./logger-reader', () => ({ readLoggerFile: jest.fn() }));
import { provideHttpClient } from '@angular/common/http';
import { provideHttpClientTesting } from '@angular/common/http/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { Component } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { MatButtonHarness } from '@angular/material/button/testing';
import type { FluxDb, LocalRecord } from '../../core/db/db-schema';
import { DeviceDb } from '../../core/db/device-db';
import { WalkContext } from '../field-day/walk-context';
import { ClosureCard } from './closure-card';
import { ClosurePanel } from './closure-panel';
import { SpotChart, type SpotChartInput } from './spot-chart';
import { until } from '../../core/db/testing/until';
import { deviceRecord } from '../../core/db/testing/test-db';

const SITE = '11111111-1111-4111-8111-111111111111';
const COLLAR = '33333333-3333-4333-8333-333333333333';
const CAMPAIGN = '44444444-4444-4444-8444-444444444444';
const VISIT = '55555555-5555-4555-8555-555555555555';
const PROFILE = '66666666-6666-4666-8666-666666666666';
const ANALYZER = '77777777-7777-4777-8777-777777777777';
const FIRST = '88888888-8888-4888-8888-888888888888';
let userNo = 0;

/**
 * jsdom has no canvas: the chart is replaced; what it was given is kept for the checks. (Declared
 * without decorator syntax: a decorator in a spec stops jest.mock above from being hoisted.)
 */
class ChartStandIn {
  data: SpotChartInput | null = null;
}
Component({ selector: 'fw-spot-chart', template: '', inputs: ['data'] })(ChartStandIn);

async function render(extra: (db: FluxDb) => Promise<void> = async () => undefined, chooseAnalyzer = true) {
  const userId = `0000000${++userNo}-0000-4000-8000-00000000000c`.slice(-36);
  localStorage.setItem(
    'fw.session',
    JSON.stringify({
      user: { id: userId, email: 'crew@fluxwalk.example', displayName: 'Crew', roles: ['crew'], siteIds: [SITE] },
      sites: [{ id: SITE, name: 'Test site' }],
    }),
  );
  TestBed.configureTestingModule({ providers: [provideHttpClient(), provideHttpClientTesting(), provideRouter([])] });
  TestBed.overrideComponent(ClosureCard, { remove: { imports: [SpotChart] }, add: { imports: [ChartStandIn] } });
  const db: FluxDb = await until(() => TestBed.inject(DeviceDb).db(), 'the database');
  await db.records('site').put(
    deviceRecord('site', {
      id: SITE,
      rev: 1,
      name: 'Test site',
      timezone: 'Europe/Berlin',
      elevationM: 420,
      ambientMarginPpm: 100,
      defaultProfileId: PROFILE,
    }),
  );
  await db.records('collar').put(
    deviceRecord('collar', {
      id: COLLAR,
      rev: 1,
      siteId: SITE,
      code: 'W-03',
      plotId: SITE,
      shape: 'round',
      diameterCm: 20,
      status: 'active',
    }),
  );
  await db.records('campaign').put(
    deviceRecord('campaign', {
      id: CAMPAIGN,
      rev: 1,
      siteId: SITE,
      name: 'Dec',
      startsOn: '2025-06-01',
      endsOn: '2025-06-30',
      rounds: 2,
      routes: [],
      dueClosures: 2,
    }),
  );
  await db.records('chamberProfile').put(
    deviceRecord('chamberProfile', {
      id: PROFILE,
      rev: 1,
      siteId: SITE,
      name: 'Dark 20',
      validFrom: '2025-01-01',
      chamberVolumeCm3: 4000,
      loopVolumeCm3: 150,
      settleS: 20,
    }),
  );
  await db.records('analyzer').put(deviceRecord('analyzer', { id: ANALYZER, rev: 1, siteId: SITE, name: 'A1', precisionPpm: 0.2 }));
  const visit: LocalRecord<'visit'> = deviceRecord('visit', {
    id: VISIT,
    rev: 1,
    siteId: SITE,
    campaignId: CAMPAIGN,
    round: 1,
    collarId: COLLAR,
    arrivedAt: '2025-06-12T06:55:00.000Z',
  });
  await db.records('visit').put(visit);
  await db.records('offsetSet').put(
    deviceRecord('offsetSet', {
      id: 'o1',
      rev: 1,
      siteId: SITE,
      visitId: VISIT,
      collarId: COLLAR,
      campaignId: CAMPAIGN,
      takenAt: '2025-06-12T06:58:00.000Z',
      readingsCm: [2, 2, 2, 2],
    }),
  );
  await extra(db);
  if (chooseAnalyzer) TestBed.inject(WalkContext).update({ analyzerId: ANALYZER });
  const fixture = TestBed.createComponent(ClosurePanel);
  fixture.componentRef.setInput('siteId', SITE);
  fixture.componentRef.setInput('campaignId', CAMPAIGN);
  fixture.componentRef.setInput('round', 1);
  fixture.componentRef.setInput('collarId', COLLAR);
  fixture.componentRef.setInput('visit', visit);
  const el = fixture.nativeElement as HTMLElement;
  const text = (sel: string) => el.querySelector(sel)?.textContent?.replace(/\s+/g, ' ').trim() ?? '';
  // The campaign asks for 2 closures a visit; the count shows it once the scene is read.
  await until(() => text('[data-testid="closure-count"]').includes('of 2 closures due'), 'the panel');
  return { db, fixture, el, text, loader: TestbedHarnessEnvironment.loader(fixture) };
}

const closuresOf = (db: FluxDb) => db.records('closure').where('visitId').equals(VISIT).sortBy('chamberOnAt');

describe('Closure panel', () => {
  afterEach(() => localStorage.clear());

  it('when the crew taps chamber on and off, then a closure with the phone times, the profile and the analyzer is stored and queued, and the due count follows', async () => {
    const { db, text, loader } = await render();
    expect(text('[data-testid="closure-count"]')).toBe('0 of 2 closures due');

    await (await loader.getHarness(MatButtonHarness.with({ text: 'Chamber on' }))).click();
    const off = await until(() => loader.getHarnessOrNull(MatButtonHarness.with({ text: 'Chamber off' })), 'the off button');
    const [open] = await closuresOf(db);
    expect(open).toMatchObject({ visitId: VISIT, collarId: COLLAR, profileId: PROFILE, analyzerId: ANALYZER, settleS: 20, redoOfId: null });
    expect(open['chamberOnAt']).toBe(open['startedAt']);
    expect(open['chamberOffAt'] ?? null).toBeNull();
    expect(text('[data-testid="closure-count"]')).toBe('1 of 2 closures due');

    await off.click();
    await until(() => loader.getHarnessOrNull(MatButtonHarness.with({ text: 'Chamber on' })), 'the on button again');
    const [closed] = await closuresOf(db);
    expect(Date.parse(String(closed['chamberOffAt']))).toBeGreaterThanOrEqual(Date.parse(String(closed['chamberOnAt'])));
    expect((await db.outbox.where('[entity+id]').equals(['closure', closed.id]).toArray()).length).toBeGreaterThanOrEqual(1);
    expect(text('[data-testid="closure-count"]')).toBe('1 of 2 closures due');
  });

  it('when a closure has a series, then its flux and flags show; Redo starts a new closure naming it, and a series typed by hand fills the redo', async () => {
    const tS = [0, 10, 20, 30, 40, 50, 60, 70, 80, 90, 100];
    const { db, el, text, loader, fixture } = await render(async (d) => {
      await d.records('analyzerCheck').put(
        deviceRecord('analyzerCheck', {
          id: 'amb',
          rev: 1,
          siteId: SITE,
          analyzerId: ANALYZER,
          kind: 'ambient',
          at: '2025-06-12T06:30:00.000Z',
          co2Ppm: 415,
        }),
      );
      await d.records('closure').put(
        deviceRecord('closure', {
          id: FIRST,
          rev: 1,
          siteId: SITE,
          visitId: VISIT,
          collarId: COLLAR,
          campaignId: CAMPAIGN,
          profileId: PROFILE,
          analyzerId: ANALYZER,
          startedAt: '2025-06-12T07:00:00.000Z',
          chamberOnAt: '2025-06-12T07:00:00.000Z',
          chamberOffAt: '2025-06-12T07:02:00.000Z',
          settleS: 20,
          // 560 ppm at the start is 145 ppm above the day's 415 ppm: more than the 100 ppm margin.
          series: { tS, co2Ppm: tS.map((t) => 560 + 0.5 * t), h2oMmolMol: null, pressureKpa: tS.map(() => 96), tempC: tS.map(() => 20) },
        }),
      );
    });
    await until(() => text('[data-testid="spot-flux"]'), 'the flux');
    // By hand, ideal gas law F = p·V/(R·T·A)·dχ/dt (R = 8.314462618, CODATA 2018), V = 4000 + 150 cm³
    // + 314.16 cm² × 2 cm = 4778.3 cm³: 96 000 × 4.7783e-3 / (8.314462618 × 293.15 × 0.0314159) × 0.5e-6 = 2.995.
    expect(text('[data-testid="spot-flux"]')).toMatch(/^3\.00 µmol m⁻² s⁻¹ \(linear;/);
    // Words and what to do now, not a code behind a tooltip a touch screen never shows.
    const flags = text('[data-testid="spot-flags"]');
    expect(flags).toContain('CO2 started well above the ambient air.');
    expect(flags).toContain('wait until the analyzer shows ambient, then redo');
    expect(flags).not.toContain('start-above-ambient');
    expect(el.querySelector('[data-testid="spot-flags"] [title]')).toBeNull();
    expect(text('.ambient')).toBe("Start vs this analyzer's ambient reading: +145 ppm");
    const chart = fixture.debugElement.query((d) => d.componentInstance instanceof ChartStandIn).componentInstance as ChartStandIn;
    expect(chart.data!.settleS).toBe(20);
    expect(chart.data!.fit.window!.firstTS).toBe(20);

    // The redo is offered right beside the advice.
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Analyzer at ambient: redo now' }))).click();
    await until(async () => (await closuresOf(db)).length === 2, `the redo (${text('.message')})`);
    const redo = (await closuresOf(db))[1];
    expect(redo['redoOfId']).toBe(FIRST);
    expect((await until(() => el.querySelector(`[data-closure="${redo.id}"] .tag`), 'the redo card')).textContent).toBe('redo');
    // The redone closure is replaced by its redo: still one counted.
    expect(text('[data-testid="closure-count"]')).toBe('1 of 2 closures due');
    // While the redo runs no redo of any kind is offered (the card's nor the flag advice's): the tap for "Chamber off" cannot land on one.
    expect(await loader.getAllHarnesses(MatButtonHarness.with({ text: /redo/i }))).toHaveLength(0);
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Chamber off' }))).click();
    await until(() => loader.getHarnessOrNull(MatButtonHarness.with({ text: 'Chamber on' })), 'the on button again');
    expect(await loader.getAllHarnesses(MatButtonHarness.with({ text: 'Redo' }))).toHaveLength(2);
    expect(await loader.getAllHarnesses(MatButtonHarness.with({ text: 'Analyzer at ambient: redo now' }))).toHaveLength(1);

    await (await loader.getHarness(MatButtonHarness.with({ text: 'Enter the series by hand' }))).click();
    await until(() => el.querySelector('textarea[name="manual"]'), 'the form');
    const set = (sel: string, v: string) => {
      const box = el.querySelector(sel) as HTMLInputElement | HTMLTextAreaElement;
      box.value = v;
      box.dispatchEvent(new Event('input'));
    };
    set(
      'textarea[name="manual"]',
      '0 420,0\n10 425,0\n20 430,0\n30 435,0\n40 440,0\n50 445,0\n60 450,0\n70 455,0\n80 460,0\n90 465,0\n100 470,0',
    );
    set('input[name="temp"]', '20');
    set('input[name="pressure"]', '96');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Save series' }))).click();
    const filled = await until(async () => {
      const r = (await closuresOf(db))[1];
      return (r['series'] as { tS: number[] }).tS.length ? r : null;
    }, 'the typed series');
    expect(filled['series']).toEqual({
      tS,
      co2Ppm: tS.map((t) => 420 + 0.5 * t),
      h2oMmolMol: null,
      pressureKpa: tS.map(() => 96),
      tempC: tS.map(() => 20),
    });
    await until(() => el.querySelector(`[data-closure="${redo.id}"] [data-testid="spot-flux"]`), 'the redo flux');
    expect(el.querySelector(`[data-closure="${redo.id}"] [data-testid="spot-flux"]`)?.textContent).toMatch(/^3\.00 µmol/);
    expect(el.querySelector(`[data-closure="${redo.id}"] [data-testid="spot-flags"]`)?.textContent).not.toContain('above the ambient');
  });

  it('when the page opens on a closure still running after a flagged one, then no redo is offered until the chamber goes off', async () => {
    const tS = [0, 10, 20, 30, 40, 50, 60, 70, 80, 90, 100];
    const { el, text, loader } = await render(async (d) => {
      await d.records('analyzerCheck').put(
        deviceRecord('analyzerCheck', {
          id: 'amb',
          rev: 1,
          siteId: SITE,
          analyzerId: ANALYZER,
          kind: 'ambient',
          at: '2025-06-12T06:30:00.000Z',
          co2Ppm: 415,
        }),
      );
      await d.records('closure').put(
        deviceRecord('closure', {
          id: FIRST,
          rev: 1,
          siteId: SITE,
          visitId: VISIT,
          collarId: COLLAR,
          campaignId: CAMPAIGN,
          profileId: PROFILE,
          analyzerId: ANALYZER,
          startedAt: '2025-06-12T07:00:00.000Z',
          chamberOnAt: '2025-06-12T07:00:00.000Z',
          chamberOffAt: '2025-06-12T07:02:00.000Z',
          settleS: 20,
          // A fall of CO2 with the chamber on: the flag advice asks for a seal check and a redo.
          series: { tS, co2Ppm: tS.map((t) => 430 - 0.5 * t), h2oMmolMol: null, pressureKpa: tS.map(() => 96), tempC: tS.map(() => 20) },
        }),
      );
      const on = new Date(Date.now() - 30_000).toISOString();
      await d.records('closure').put(
        deviceRecord('closure', {
          id: 'running',
          rev: 1,
          siteId: SITE,
          visitId: VISIT,
          collarId: COLLAR,
          campaignId: CAMPAIGN,
          profileId: PROFILE,
          analyzerId: ANALYZER,
          startedAt: on,
          chamberOnAt: on,
          chamberOffAt: null,
          settleS: 20,
          redoOfId: null,
          series: { tS: [], co2Ppm: [], h2oMmolMol: null, pressureKpa: null, tempC: null },
        }),
      );
    });
    await until(() => text('[data-testid="spot-flux"]'), "the first closure's flux");
    await until(() => loader.getHarnessOrNull(MatButtonHarness.with({ text: 'Chamber off' })), 'the running closure');
    expect(text('[data-testid="spot-flags"]')).toContain('then redo the closure');
    expect(await loader.getAllHarnesses(MatButtonHarness.with({ text: /redo/i }))).toHaveLength(0);
    expect(el.querySelector('[data-testid="flag-redo"]')).toBeNull();

    await (await loader.getHarness(MatButtonHarness.with({ text: 'Chamber off' }))).click();
    await until(
      () => loader.getHarnessOrNull(MatButtonHarness.with({ text: 'Seal checked: redo now' })),
      "the flag advice's redo once the closure ended",
    );
    expect(await loader.getAllHarnesses(MatButtonHarness.with({ text: 'Redo' }))).toHaveLength(2);
  });

  it('when the crew chose a chamber at the start of the day, then a tapped closure carries that chamber’s version of the day and its settle time, not the site default', async () => {
    const TALL = '99999999-9999-4999-8999-999999999999';
    const TALL_NEW = '99999999-9999-4999-8999-99999999999a';
    const { db, loader } = await render(async (d) => {
      await d.records('chamberProfile').put(
        deviceRecord('chamberProfile', {
          id: TALL,
          rev: 1,
          siteId: SITE,
          name: 'Tall',
          validFrom: '2025-01-01',
          chamberVolumeCm3: 6000,
          loopVolumeCm3: 150,
          settleS: 30,
        }),
      );
      await d.records('chamberProfile').put(
        deviceRecord('chamberProfile', {
          id: TALL_NEW,
          rev: 1,
          siteId: SITE,
          name: 'Tall',
          validFrom: '2025-03-01',
          chamberVolumeCm3: 6000,
          loopVolumeCm3: 210,
          settleS: 35,
        }),
      );
      TestBed.inject(WalkContext).update({ profileId: TALL });
    });
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Chamber on' }))).click();
    const [open] = await until(async () => {
      const l = await closuresOf(db);
      return l.length ? l : null;
    }, 'the closure');
    expect(open).toMatchObject({ profileId: TALL_NEW, analyzerId: ANALYZER, settleS: 35 });
  });

  it('when no analyzer was chosen today, then no closure can start: the bar asks for one (last used first) and one tap starts the day', async () => {
    const second = '99999999-9999-4999-8999-999999999999';
    const { db, text, loader } = await render(async (d) => {
      await d.records('analyzer').put(deviceRecord('analyzer', { id: second, rev: 1, siteId: SITE, name: 'B2', precisionPpm: 0.5 }));
    }, false);
    // Yesterday's analyzer is the last used, but it is not today's.
    TestBed.inject(WalkContext).update({ analyzerId: ANALYZER, kitAt: new Date(Date.now() - 2 * 86_400_000).toISOString() });
    await until(() => text('[data-testid="day-kit-gate"]'), 'the gate');
    expect(text('[data-testid="day-kit-gate"]')).toMatch(/^Which analyzer today\? .*\)\.\s*A1 \(last used\)\s*B2\s*Start of day$/);
    expect(await loader.getAllHarnesses(MatButtonHarness.with({ text: 'Chamber on' }))).toHaveLength(0);
    expect(await closuresOf(db)).toHaveLength(0);

    await (await loader.getHarness(MatButtonHarness.with({ text: 'B2' }))).click();
    await (await until(() => loader.getHarnessOrNull(MatButtonHarness.with({ text: 'Chamber on' })), 'the on button')).click();
    await until(async () => (await closuresOf(db)).length === 1, 'the closure');
    expect((await closuresOf(db))[0]).toMatchObject({ analyzerId: second, profileId: PROFILE });
    expect(text('[data-testid="day-kit"]')).toBe('Today: B2 · Dark 20, 120 s closures');
  });

  it('when a closure was stored without an analyzer, then its card says so instead of "no flags"', async () => {
    const tS = [0, 10, 20, 30, 40, 50, 60, 70, 80, 90, 100];
    const { text } = await render(async (d) => {
      await d.records('closure').put(
        deviceRecord('closure', {
          id: FIRST,
          rev: 1,
          siteId: SITE,
          visitId: VISIT,
          collarId: COLLAR,
          campaignId: CAMPAIGN,
          profileId: PROFILE,
          analyzerId: null,
          startedAt: '2025-06-12T07:00:00.000Z',
          chamberOnAt: '2025-06-12T07:00:00.000Z',
          chamberOffAt: '2025-06-12T07:02:00.000Z',
          settleS: 20,
          series: { tS, co2Ppm: tS.map((t) => 420 + 0.5 * t), h2oMmolMol: null, pressureKpa: tS.map(() => 96), tempC: tS.map(() => 20) },
        }),
      );
    });
    await until(() => text('[data-testid="no-analyzer"]'), 'the warning');
    expect(text('[data-testid="no-analyzer"]')).toContain('No analyzer named for this closure');
    expect(text('[data-testid="spot-flags"]')).not.toContain('no flags');
  });
});

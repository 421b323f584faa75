import { provideHttpClient } from '@angular/common/http';

// The visit screen hosts the closure panel, whose logger reader starts a module Web Worker via
// import.meta (not loadable under CommonJS jest); nothing here reads logger files.
jest.mock('../closures/logger-reader', () => ({ readLoggerFile: jest.fn() }));
import { provideHttpClientTesting } from '@angular/common/http/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { TestBed } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatChipListboxHarness } from '@angular/material/chips/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { provideRouter } from '@angular/router';
import type { FluxDb } from '../../core/db/db-schema';
import { DeviceDb } from '../../core/db/device-db';
import { SkipForm } from './skip-form';
import { VisitPage } from './visit-page';
import { WalkContext } from '../field-day/walk-context';
import { until } from '../../core/db/testing/until';

const SITE = '11111111-1111-4111-8111-111111111111';
const PLOT = '22222222-2222-4222-8222-222222222222';
const COLLAR = '33333333-3333-4333-8333-333333333333';
const CAMPAIGN = '44444444-4444-4444-8444-444444444444';
let userNo = 0;

describe('SkipForm', () => {
  async function render() {
    TestBed.configureTestingModule({ imports: [SkipForm] });
    const fixture = TestBed.createComponent(SkipForm);
    const reasons: string[] = [];
    fixture.componentInstance.skip.subscribe((r) => reasons.push(r));
    return { fixture, reasons, loader: TestbedHarnessEnvironment.loader(fixture) };
  }

  it('when a skip is confirmed without a reason, then nothing is emitted and the reason is asked for', async () => {
    const { fixture, reasons, loader } = await render();
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Skip this collar…' }))).click();
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Skip collar' }))).click();
    expect(reasons).toEqual([]);
    expect((fixture.nativeElement as HTMLElement).querySelector('[role="alert"]')?.textContent).toContain('Say why');
  });

  it('when a common reason is tapped and edited, then the edited reason is emitted trimmed', async () => {
    const { reasons, loader } = await render();
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Skip this collar…' }))).click();
    const chips = await loader.getHarness(MatChipListboxHarness);
    await chips.selectChips({ text: 'Standing water over the rim' });
    const box = await loader.getHarness(MatInputHarness.with({ selector: '[data-testid="skip-reason"]' }));
    expect(await box.getValue()).toBe('Standing water over the rim');
    await box.setValue('  Standing water over the rim after the storm ');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Skip collar' }))).click();
    expect(reasons).toEqual(['Standing water over the rim after the storm']);
  });
});

describe('Visit screen skip flow', () => {
  afterEach(() => localStorage.clear());

  it('when the crew skips a collar with a reason, then a skipped visit and its outbox op are on the device and the screen shows the reason', async () => {
    const userId = `0000000${++userNo}-0000-4000-8000-00000000000a`.slice(-36);
    localStorage.setItem(
      'fw.session',
      JSON.stringify({
        user: { id: userId, email: 'crew@fluxwalk.example', displayName: 'Crew', roles: ['crew'], siteIds: [SITE] },
        sites: [{ id: SITE, name: 'Test site' }],
      }),
    );
    TestBed.configureTestingModule({ providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting()] });
    const deviceDb = TestBed.inject(DeviceDb);
    const db: FluxDb = await until(() => deviceDb.db(), 'the database');
    await db
      .records('site')
      .put({ id: SITE, rev: 1, name: 'Test site', offsetSpreadPct: 3, offsetMoveCm: 1, moistureCalibration: { kind: 'topp' } });
    await db.records('plot').put({ id: PLOT, rev: 1, siteId: SITE, code: 'P1' });
    await db
      .records('collar')
      .put({ id: COLLAR, rev: 1, siteId: SITE, plotId: PLOT, code: 'W-03', shape: 'round', diameterCm: 20, status: 'active' });
    await db.records('campaign').put({ id: CAMPAIGN, rev: 1, siteId: SITE, name: 'Dec', rounds: 2, routes: [] });
    TestBed.inject(WalkContext).update({ campaignId: CAMPAIGN, round: 2 });

    const fixture = TestBed.createComponent(VisitPage);
    fixture.componentRef.setInput('collarId', COLLAR);
    const loader = TestbedHarnessEnvironment.loader(fixture);
    const el = fixture.nativeElement as HTMLElement;
    await until(() => el.querySelector('[data-testid="visit-code"]')?.textContent === 'W-03', 'the collar');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Skip this collar…' }))).click();
    await (await loader.getHarness(MatInputHarness.with({ selector: '[data-testid="skip-reason"]' }))).setValue('Plot flooded');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Skip collar' }))).click();

    const visits = await until(async () => {
      const v = await db.records('visit').toArray();
      return v.length ? v : null;
    }, 'the visit');
    expect(visits).toHaveLength(1);
    expect(visits[0]).toMatchObject({
      collarId: COLLAR,
      campaignId: CAMPAIGN,
      round: 2,
      siteId: SITE,
      skipped: true,
      skipReason: 'Plot flooded',
      crewId: userId,
    });
    const ops = await db.outbox.toArray();
    expect(ops.map((o) => [o.entity, o.id, o.fields['skipped']])).toEqual([['visit', visits[0].id, true]]);
    await until(() => el.querySelector('[data-testid="skip-shown"]'), 'the skipped state');
    expect(el.querySelector('[data-testid="skip-shown"]')!.textContent!.trim()).toBe('Reason: Plot flooded');
    fixture.destroy();
  });
});

// The leak check reads logger files in a module Web Worker (import.meta, not loadable under CommonJS jest); nothing here reads one.
jest.mock('../closures/logger-reader', () => ({ readLoggerFile: jest.fn() }));
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { TestBed } from '@angular/core/testing';
import { MatSelectHarness } from '@angular/material/select/testing';
import { ClosureWrites } from '../closures/closure-writes';
import { signedInDevice, TEST_SITE } from '../../core/db/testing/signed-in-device';
import { until } from '../../core/db/testing/until';
import { formatSiteTime, siteDayStart } from '../../../../shared/time/site-time';
import { StartOfDay } from './start-of-day';
import { WalkContext } from '../field-day/walk-context';

const TALL_OLD = 'aaaaaaaa-0000-4000-8000-000000000001';
const TALL = 'aaaaaaaa-0000-4000-8000-000000000002';
const SHORT = 'aaaaaaaa-0000-4000-8000-000000000003';
const ANALYZER = 'aaaaaaaa-0000-4000-8000-000000000004';
const ids = {
  campaignId: 'aaaaaaaa-0000-4000-8000-000000000005',
  collarId: 'aaaaaaaa-0000-4000-8000-000000000006',
  visitId: 'aaaaaaaa-0000-4000-8000-000000000007',
};

describe('Start of day: the crew’s chamber system', () => {
  afterEach(() => localStorage.clear());

  it('when the crew picks its chamber, then the choice is kept for this user and a logger piece without a tap gets that chamber’s version and settle time', async () => {
    const { db } = await signedInDevice();
    await db.records('site').put({ id: TEST_SITE, rev: 1, name: 'Test site', timezone: 'UTC', defaultProfileId: SHORT });
    await db.records('analyzer').put({ id: ANALYZER, rev: 1, siteId: TEST_SITE, name: 'A', serial: '' });
    const profile = (id: string, name: string, validFrom: string, settleS: number) =>
      db
        .records('chamberProfile')
        .put({ id, rev: 1, siteId: TEST_SITE, name, validFrom, chamberVolumeCm3: 4000, loopVolumeCm3: 100, settleS });
    await profile(TALL_OLD, 'Tall', '2020-01-01', 25);
    await profile(TALL, 'Tall', '2021-01-01', 30);
    await profile(SHORT, 'Short', '2021-06-01', 15);

    const fixture = TestBed.createComponent(StartOfDay);
    const loader = TestbedHarnessEnvironment.loader(fixture);
    const select = await loader.getHarness(MatSelectHarness.with({ selector: '[data-testid="chamber-profile"]' }));
    await until(async () => {
      await select.open();
      return (await select.getOptions()).length === 2 ? true : null;
    }, 'the chambers');
    expect(await Promise.all((await select.getOptions()).map((o) => o.getText()))).toEqual(['Short', 'Tall']);
    await select.clickOptions({ text: 'Tall' });
    expect(TestBed.inject(WalkContext).choice().profileId).toBe(TALL);

    // A piece of the logger file assigned to a visit without a tap: the crew's chamber, not the site default.
    const site = (await db.records('site').get(TEST_SITE))!;
    const profiles = await db.records('chamberProfile').toArray();
    const tS = [0, 10, 20, 30];
    const rec = await TestBed.inject(ClosureWrites).createFromPiece(
      { siteId: TEST_SITE, ...ids, analyzerId: ANALYZER, profileId: TestBed.inject(WalkContext).choice().profileId },
      site,
      profiles,
      { tS, co2Ppm: [420, 421, 422, 423], h2oMmolMol: null, pressureKpa: null, tempC: null },
      '2026-06-01T09:00:00.000Z',
      '2026-06-01T09:00:30.000Z',
      null,
    );
    expect(rec).toMatchObject({ profileId: TALL, analyzerId: ANALYZER, settleS: 30 });
    fixture.destroy();
  });
});

describe('Start of day: the site’s day and time', () => {
  afterEach(() => localStorage.clear());
  const ZONE = 'Pacific/Auckland';

  async function render(checks: { kind: string; at: string }[]) {
    const { db } = await signedInDevice();
    await db.records('site').put({ id: TEST_SITE, rev: 1, name: 'Test site', timezone: ZONE });
    let n = 0;
    for (const c of checks) {
      await db
        .records('analyzerCheck')
        .put({ id: `bbbbbbbb-0000-4000-8000-00000000000${++n}`, rev: 1, siteId: TEST_SITE, skipped: false, passed: true, ...c });
    }
    const fixture = TestBed.createComponent(StartOfDay);
    const el = fixture.nativeElement as HTMLElement;
    return { fixture, el };
  }

  it('when a check was made today, then its time reads in the site’s zone (naming it), not the device’s', async () => {
    // The device runs in UTC; Auckland is 12 or 13 hours ahead.
    const at = new Date(Date.now() - 60_000).toISOString();
    const { fixture, el } = await render([{ kind: 'safety-ack', at }]);
    const shown = await until(async () => {
      fixture.detectChanges();
      return el.querySelector('[data-testid="check-safety-ack"] [data-testid="check-result"]')?.textContent ?? null;
    }, 'the check');
    expect(shown.replace(/\s+/g, ' ')).toContain(`(${formatSiteTime(at, ZONE, { timeOnly: true })})`);
    fixture.destroy();
  });

  it('when the device’s day and the site’s day start at different instants, then a check counts for today by the site’s day', async () => {
    const now = new Date();
    const deviceStart = new Date(now.getFullYear(), now.getMonth(), now.getDate()).getTime();
    const siteStart = Date.parse(siteDayStart(ZONE, now));
    // An instant between the two starts is "today" on one clock and "yesterday" on the other.
    const between = new Date(Math.min(deviceStart, siteStart) + Math.abs(siteStart - deviceStart) / 2).toISOString();
    const todayAtSite = between >= new Date(siteStart).toISOString();
    const { fixture, el } = await render([
      { kind: 'warm-up', at: between },
      { kind: 'safety-ack', at: new Date(now.getTime() - 1000).toISOString() },
    ]);
    await until(async () => {
      fixture.detectChanges();
      return el.querySelector('[data-testid="check-safety-ack"] [data-testid="check-result"]');
    }, 'the checks');
    expect(!!el.querySelector('[data-testid="check-warm-up"] [data-testid="check-result"]')).toBe(todayAtSite);
    fixture.destroy();
  });
});

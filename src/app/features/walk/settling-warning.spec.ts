import { provideHttpClient } from '@angular/common/http';

// The visit screen hosts the closure panel, whose logger reader starts a module Web Worker via
// import.meta (not loadable under CommonJS jest); nothing here reads logger files.
jest.mock('../closures/logger-reader', () => ({ readLoggerFile: jest.fn() }));
import { provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import type { FluxDb, LocalRecord } from '../../core/db/db-schema';
import { DeviceDb } from '../../core/db/device-db';
import { VisitPage } from './visit-page';
import { settlingNote } from './visit-query';
import { until } from '../../core/db/testing/until';

// Collar insertion cuts roots and disturbs the soil, so closures right after an install or a reseat
// read high: waiting at least a day, better about a week, is common practice (from memory; the
// site sets both limits: settlingDaysHard, settlingDaysWarn).
const SITE = '11111111-1111-4111-8111-111111111111';
const PLOT = '22222222-2222-4222-8222-222222222222';
const COLLAR = '33333333-3333-4333-8333-333333333333';
const site = { id: SITE, rev: 1, settlingDaysHard: 2, settlingDaysWarn: 7 } as LocalRecord<'site'>;
const collar = (installedOn: string | null) => ({ id: COLLAR, rev: 1, installedOn }) as LocalRecord<'collar'>;
const event = (kind: string, date: string, deleted = false) =>
  ({ id: `${kind}-${date}`, rev: 1, kind, date, deleted }) as LocalRecord<'collarEvent'>;
const NOW = new Date(2026, 5, 15, 10, 0); // 15 June 2026, 10:00 on the device's clock

describe('settlingNote', () => {
  it('when the install is within the hard limit, then closures should wait', () => {
    expect(settlingNote(collar('2026-06-14'), [], site, NOW)).toEqual({ level: 'hard', days: 1, since: '2026-06-14', what: 'installed' });
  });

  it('when the newest disturbance is a reseat past the hard limit, then it is a warning naming the reseat', () => {
    const events = [event('installed', '2026-03-01'), event('reseated', '2026-06-12'), event('clipped', '2026-06-14')];
    expect(settlingNote(collar('2026-03-01'), events, site, NOW)).toEqual({
      level: 'warn',
      days: 3,
      since: '2026-06-12',
      what: 'reseated',
    });
  });

  it('when the site’s day is ahead of the device’s, then the days since the install count by the site’s calendar', () => {
    // 20:00 UTC on 14 June is 08:00 on 15 June in Auckland (NZST, UTC+12): an install on the 14th is a day old there.
    const auckland = { ...site, timezone: 'Pacific/Auckland' };
    expect(settlingNote(collar('2026-06-14'), [], auckland, new Date('2026-06-14T20:00:00Z'))).toMatchObject({ days: 1 });
    // 11:00 UTC on 15 June is 01:00 on 15 June in Honolulu (HST, UTC−10): still the day of a 15 June install.
    expect(
      settlingNote(collar('2026-06-15'), [], { ...site, timezone: 'Pacific/Honolulu' }, new Date('2026-06-15T11:00:00Z')),
    ).toMatchObject({ days: 0 });
  });

  it('when the warning limit has passed, or the only recent reseat was deleted, then there is no note', () => {
    expect(settlingNote(collar('2026-06-08'), [], site, NOW)).toBeNull(); // 7 days: not < 7
    expect(settlingNote(collar('2026-01-10'), [event('reseated', '2026-06-14', true)], site, NOW)).toBeNull();
  });

  it('when the site sets no limits, then one day (hard) and seven days (warning) apply', () => {
    expect(settlingNote(collar('2026-06-15'), [], null, NOW)?.level).toBe('hard');
    expect(settlingNote(collar('2026-06-14'), [], null, NOW)?.level).toBe('warn');
    expect(settlingNote(collar('2026-06-09'), [], null, NOW)?.level).toBe('warn');
    expect(settlingNote(collar('2026-06-08'), [], null, NOW)).toBeNull();
  });
});

const localDaysAgo = (n: number) => {
  const d = new Date();
  d.setDate(d.getDate() - n);
  return `${d.getFullYear()}-${String(d.getMonth() + 1).padStart(2, '0')}-${String(d.getDate()).padStart(2, '0')}`;
};

describe('Visit screen settling warning', () => {
  let userNo = 0;
  afterEach(() => localStorage.clear());

  async function open(installedOn: string, events: LocalRecord[], extra: { timezone?: string; closures?: LocalRecord[] } = {}) {
    const userId = `0000000${++userNo}-0000-4000-8000-00000000000d`.slice(-36);
    localStorage.setItem(
      'fw.session',
      JSON.stringify({
        user: { id: userId, email: 'crew@fluxwalk.example', displayName: 'Crew', roles: ['crew'], siteIds: [SITE] },
        sites: [{ id: SITE, name: 'Test site' }],
      }),
    );
    TestBed.configureTestingModule({ providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting()] });
    const db: FluxDb = await until(() => TestBed.inject(DeviceDb).db(), 'the database');
    await db
      .records('site')
      .put({ ...site, name: 'Test site', moistureCalibration: { kind: 'topp' }, ...(extra.timezone ? { timezone: extra.timezone } : {}) });
    if (extra.closures) await db.records('closure').bulkPut(extra.closures.map((c) => ({ ...c, siteId: SITE, collarId: COLLAR })));
    await db.records('plot').put({ id: PLOT, rev: 1, siteId: SITE, code: 'P1' });
    await db
      .records('collar')
      .put({ id: COLLAR, rev: 1, siteId: SITE, plotId: PLOT, code: 'W-03', shape: 'round', diameterCm: 20, status: 'active', installedOn });
    await db.records('collarEvent').bulkPut(events.map((e) => ({ ...e, siteId: SITE, collarId: COLLAR })));
    const fixture = TestBed.createComponent(VisitPage);
    fixture.componentRef.setInput('collarId', COLLAR);
    const el = fixture.nativeElement as HTMLElement;
    await until(() => el.querySelector('[data-testid="visit-code"]')?.textContent === 'W-03', 'the collar');
    const warning = () => el.querySelector('[data-testid="settling"]');
    return { fixture, warning, el };
  }

  it('when the collar went in today, then the screen tells the crew to wait before closures, as an alert', async () => {
    const today = localDaysAgo(0);
    const { fixture, warning } = await open(today, []);
    expect(warning()?.getAttribute('role')).toBe('alert');
    expect(warning()?.textContent?.replace(/\s+/g, ' ').trim()).toBe(
      `Installed 0 days ago (${today}): the soil is still disturbed — wait before closures.`,
    );
    fixture.destroy();
  });

  it('when the collar was reseated three days ago, then the screen warns that closures may still show it', async () => {
    const reseat = localDaysAgo(3);
    const { fixture, warning } = await open('2026-01-10', [event('reseated', reseat)]);
    expect(warning()?.textContent?.replace(/\s+/g, ' ').trim()).toBe(
      `Reseated 3 days ago (${reseat}): closures may still show the disturbance.`,
    );
    fixture.destroy();
  });

  it('when the last disturbance is older than the warning limit, then no settling warning shows', async () => {
    const { fixture, warning } = await open(localDaysAgo(30), [event('reseated', localDaysAgo(8))]);
    expect(warning()).toBeNull();
    fixture.destroy();
  });

  it('when the collar has a flux from an earlier visit, then its day reads as the site’s day, not the device’s', async () => {
    // 20:30 UTC on 1 June is 08:30 on 2 June in Auckland (NZST, UTC+12); the device runs in UTC.
    const { fixture, el } = await open('2026-01-10', [], {
      timezone: 'Pacific/Auckland',
      closures: [
        { id: '55555555-5555-4555-8555-555555555555', rev: 1, startedAt: '2026-06-01T20:30:00.000Z', fluxUmolM2S: 2.5 } as LocalRecord,
      ],
    });
    const line = await until(
      () => (el.querySelector('.facts-line')?.textContent?.includes('2.50') ? el.querySelector('.facts-line')!.textContent! : null),
      'the last flux',
    );
    expect(line.replace(/\s+/g, ' ')).toContain('last flux 2.50 µmol m⁻² s⁻¹ (2026-06-02)');
    fixture.destroy();
  });
});

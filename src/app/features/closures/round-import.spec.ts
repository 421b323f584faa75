// The screen reads files in a module Web Worker (import.meta, not loadable under CommonJS jest):
// here the same parser runs in the test's thread.
jest.mock('./logger-reader', () => ({
  readLoggerFile: (text: string, mapping: unknown, progress: (f: number) => void) =>
    Promise.resolve(jest.requireActual('./logger-parse').parseLoggerText(text, mapping, progress)),
}));
import { provideHttpClient } from '@angular/common/http';
import { provideHttpClientTesting } from '@angular/common/http/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { TestBed } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatSelectHarness } from '@angular/material/select/testing';
import { provideRouter } from '@angular/router';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { guessLayout, suggestMapping, type LoggerMapping } from '../../../../shared/logger';
import type { FluxDb, LocalRecord } from '../../core/db/db-schema';
import { DeviceDb } from '../../core/db/device-db';
import { until } from '../../core/db/testing/until';
import { deviceRecord } from '../../core/db/testing/test-db';
import { WalkContext } from '../field-day/walk-context';
import { RoundImport } from './round-import';

const SITE = '11111111-1111-4111-8111-111111111111';
const CAMPAIGN = '44444444-4444-4444-8444-444444444444';
const ANALYZER = '77777777-7777-4777-8777-777777777777';
const COLLARS = { A: '33333333-3333-4333-8333-33333333333a', B: '33333333-3333-4333-8333-33333333333b' };
const VISITS = { A: '55555555-5555-4555-8555-55555555555a', B: '55555555-5555-4555-8555-55555555555b' };
const fixture = (name: string) => readFileSync(join(__dirname, '../../../../test/fixtures/logger', name), 'utf8');
// Two collars, two closures each; the analyzer's clock runs 73 s ahead of the taps (test/fixtures/logger/README.md).
const ROUND_FILE = fixture('walk-two-collars.csv');
const TAPS: [keyof typeof COLLARS, string][] = [
  ['A', '08:41'],
  ['A', '08:45'],
  ['B', '08:55'],
  ['B', '08:59'],
];
let userNo = 0;

function closure(i: number, collar: keyof typeof COLLARS, hhmm: string, closed: boolean): LocalRecord<'closure'> {
  const on = `2026-12-03T${hhmm}:00.000Z`;
  return deviceRecord('closure', {
    id: `99999999-9999-4999-8999-99999999999${i}`,
    rev: 1,
    siteId: SITE,
    visitId: VISITS[collar],
    collarId: COLLARS[collar],
    campaignId: CAMPAIGN,
    profileId: null,
    analyzerId: ANALYZER,
    startedAt: on,
    chamberOnAt: on,
    chamberOffAt: closed ? new Date(Date.parse(on) + 120_000).toISOString() : null,
    settleS: 20,
    redoOfId: null,
    series: { tS: [], co2Ppm: [], h2oMmolMol: null, pressureKpa: null, tempC: null },
  });
}

/** The round on the device: two visits, the taps (the last two left open when `openTaps`), and the walk's choice. */
async function render(opts: { openTaps?: boolean } = {}) {
  const userId = `0000000${++userNo}-0000-4000-8000-00000000000e`.slice(-36);
  localStorage.setItem(
    'fw.session',
    JSON.stringify({
      user: { id: userId, email: 'crew@fluxwalk.example', displayName: 'Crew', roles: ['crew'], siteIds: [SITE] },
      sites: [{ id: SITE, name: 'Test site' }],
    }),
  );
  TestBed.configureTestingModule({ providers: [provideHttpClient(), provideHttpClientTesting(), provideRouter([])] });
  const db: FluxDb = await until(() => TestBed.inject(DeviceDb).db(), 'the database');
  await db.records('site').put(deviceRecord('site', { id: SITE, rev: 1, name: 'Test site', timezone: 'Europe/Berlin', elevationM: 420 }));
  await db.records('campaign').put(
    deviceRecord('campaign', {
      id: CAMPAIGN,
      rev: 1,
      siteId: SITE,
      name: 'Dec',
      startsOn: '2026-12-01',
      endsOn: '2026-12-31',
      rounds: 2,
      routes: [],
      dueClosures: 2,
    }),
  );
  for (const k of ['A', 'B'] as const) {
    await db.records('collar').put(
      deviceRecord('collar', {
        id: COLLARS[k],
        rev: 1,
        siteId: SITE,
        code: k,
        plotId: SITE,
        shape: 'round',
        diameterCm: 20,
        status: 'active',
      }),
    );
    await db.records('visit').put(
      deviceRecord('visit', {
        id: VISITS[k],
        rev: 1,
        siteId: SITE,
        campaignId: CAMPAIGN,
        round: 1,
        collarId: COLLARS[k],
        arrivedAt: k === 'A' ? '2026-12-03T08:38:00.000Z' : '2026-12-03T08:52:00.000Z',
      }),
    );
  }
  for (const [i, [k, hhmm]] of TAPS.entries()) await db.records('closure').put(closure(i, k, hhmm, !(opts.openTaps && k === 'B')));
  TestBed.inject(WalkContext).update({ campaignId: CAMPAIGN, round: 1, analyzerId: ANALYZER });
  const f = TestBed.createComponent(RoundImport);
  const el = f.nativeElement as HTMLElement;
  const text = (sel: string) => el.querySelector(sel)?.textContent?.replace(/\s+/g, ' ').trim() ?? '';
  const loader = TestbedHarnessEnvironment.loader(f);
  // Every tap the crew makes on this screen is counted (the file picker is the phone's own).
  let taps = 0;
  const pick = async (content: string, name = 'round.csv') => {
    const input = await until(() => el.querySelector<HTMLInputElement>('input[type="file"]'), 'the file input');
    Object.defineProperty(input, 'files', {
      value: [Object.assign(new Blob([content], { type: 'text/csv' }), { name })],
      configurable: true,
    });
    taps++;
    input.dispatchEvent(new Event('change'));
  };
  const save = async () => {
    const b = await loader.getHarness(MatButtonHarness.with({ text: /^Save / }));
    return b;
  };
  return { db, el, text, loader, pick, save, tap: () => taps++, taps: () => taps };
}

describe('Round import: one logger file for every collar of the round', () => {
  afterEach(() => localStorage.clear());

  it('when every piece matches its tap, then one tap saves them all: four closure series, one attachment for the file, all in the outbox', async () => {
    const { db, text, pick, save, tap, taps } = await render();
    await pick(ROUND_FILE);
    await until(() => text('[data-testid="round-summary"]'), 'the review');
    expect(text('[data-testid="round-summary"]')).toBe('4 closures of 4 closures in round.csv matched to their taps at 2 collars.');
    expect(text('[data-testid="unplaced"]')).toBe('');
    const button = await save();
    expect(await button.getText()).toBe('Save 4 closures');
    tap();
    await button.click();
    await until(() => text('[data-testid="import-done"]'), 'the save');
    expect(text('[data-testid="import-done"]')).toBe('4 closures filled from round.csv.');
    expect(taps()).toBe(2);

    const closures = await db.records('closure').toArray();
    const attachments = await db.records('attachment').toArray();
    expect(attachments).toHaveLength(1);
    expect(closures).toHaveLength(4);
    for (const c of closures) {
      expect((c['series'] as { tS: number[] }).tS).toHaveLength(61);
      expect(c['sourceAttachmentId']).toBe(attachments[0].id);
    }
    // Each collar's closures got the pieces that started just after its own taps (logger 73 s ahead).
    for (const c of closures) expect(Date.parse(String(c['startedAt'])) - Date.parse(String(c['chamberOnAt']))).toBeLessThan(5000);
    const ops = await db.outbox.toArray();
    expect(
      ops
        .filter((o) => o.entity === 'closure' && o.op === 'upsert')
        .map((o) => o.id)
        .sort(),
    ).toEqual(closures.map((c) => c.id).sort());
    expect(ops.filter((o) => o.entity === 'attachment')).toHaveLength(1);
  });

  it('when a piece could belong to two taps, then saving waits until the crew places it with the select; then all four are written', async () => {
    const { db, text, pick, save, loader } = await render({ openTaps: true });
    await pick(ROUND_FILE);
    await until(() => text('[data-testid="round-summary"]'), 'the review');
    expect(text('[data-testid="unplaced"]')).toBe('Place 1 closure above (or leave it out) to save.');
    expect(text('#open-title')).toBe('To place (1)');
    expect(await (await save()).isDisabled()).toBe(true);
    const select = await loader.getHarness(MatSelectHarness.with({ ancestor: 'section[aria-labelledby="open-title"]' }));
    await select.open();
    const options = (await select.getOptions()).map((o) => o.getText());
    expect(await Promise.all(options)).toEqual([
      'leave out (kept in the file)',
      'A · tap 09:41:00',
      'A · tap 09:45:00',
      'A · new closure',
      'B · tap 09:55:00',
      'B · tap 09:59:00',
      'B · new closure',
    ]);
    await select.clickOptions({ text: 'B · tap 09:59:00' });
    expect(text('[data-testid="unplaced"]')).toBe('');
    const button = await save();
    expect(await button.isDisabled()).toBe(false);
    await button.click();
    await until(() => text('[data-testid="import-done"]'), 'the save');
    const filled = (await db.records('closure').toArray()).filter((c) => (c['series'] as { tS: number[] }).tS.length);
    expect(filled).toHaveLength(4);
  });

  it('when the analyzer has a saved mapping for this header, then the file is read at once; without one, the screen asks for the mapping first', async () => {
    const file = fixture('semicolon-decimal-comma.csv');
    const first = await render();
    await first.pick(file, 'day.csv');
    await until(() => first.text('[data-testid="unmapped"]'), 'the mapping request');
    expect(first.text('[data-testid="round-summary"]')).toBe('');
    TestBed.resetTestingModule();

    const layout = guessLayout(file);
    const saved: LoggerMapping = {
      ...suggestMapping(layout.headers, layout, 'Europe/Berlin')!,
      headers: layout.headers,
      time: { kind: 'timestamp', column: 0, format: 'DD.MM.YYYY HH:mm:ss', timeZone: 'Europe/Berlin' },
    };
    localStorage.setItem(`fw.logger-preset.${ANALYZER}`, JSON.stringify(saved));
    const again = await render();
    await again.pick(file, 'day.csv');
    await until(() => again.text('[data-testid="round-summary"]'), 'the review');
    expect(again.text('[data-testid="unmapped"]')).toBe('');
    // The file is of another day: its one closure matches no tap of this round and waits for the crew.
    expect(again.text('[data-testid="round-summary"]')).toBe('0 closures of 1 closure in day.csv matched to their taps at 2 collars.');
    expect(again.text('[data-testid="taps-without"] h2')).toBe('Taps with no closure in this file (4)');
  });
});

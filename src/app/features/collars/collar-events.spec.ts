import { provideHttpClient } from '@angular/common/http';
import { provideHttpClientTesting } from '@angular/common/http/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { TestBed } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { MatSelectHarness } from '@angular/material/select/testing';
import { provideRouter } from '@angular/router';
import type { FluxDb } from '../../core/db/db-schema';
import { DeviceDb } from '../../core/db/device-db';
import { CollarEvents } from './collar-events';
import { until } from '../../core/db/testing/until';
import { deviceRecord } from '../../core/db/testing/test-db';
import { zoneAwayFromDevice } from '../../core/db/testing/signed-in-device';
import { siteToday } from '../../../../shared/time/site-time';

const SITE = '11111111-1111-4111-8111-111111111111';
const OTHER_SITE = '11111111-1111-4111-8111-999999999999';
const COLLAR = '33333333-3333-4333-8333-333333333333';
const NEW_COLLAR = '33333333-3333-4333-8333-444444444444';
const COLLAR_10 = '33333333-3333-4333-8333-555555555555';
const ELSEWHERE = '33333333-3333-4333-8333-666666666666';
let userNo = 0;

async function render(timezone?: string) {
  const userId = `0000000${++userNo}-0000-4000-8000-00000000000c`.slice(-36);
  localStorage.setItem(
    'fw.session',
    JSON.stringify({
      user: { id: userId, email: 'crew@fluxwalk.example', displayName: 'Crew', roles: ['crew'], siteIds: [SITE] },
      sites: [{ id: SITE, name: 'Test site', ...(timezone ? { timezone } : {}) }],
    }),
  );
  TestBed.configureTestingModule({ providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting()] });
  const db: FluxDb = await until(() => TestBed.inject(DeviceDb).db(), 'the database');
  await db
    .records('collar')
    .bulkPut([
      deviceRecord('collar', { id: COLLAR, rev: 1, siteId: SITE, code: 'W-2', plotId: SITE, diameterCm: 20 }),
      deviceRecord('collar', { id: COLLAR_10, rev: 1, siteId: SITE, code: 'W-10', plotId: SITE, diameterCm: 20 }),
      deviceRecord('collar', { id: NEW_COLLAR, rev: 1, siteId: SITE, code: 'W-9', plotId: SITE, diameterCm: 20 }),
      deviceRecord('collar', { id: ELSEWHERE, rev: 1, siteId: OTHER_SITE, code: 'X-1', plotId: OTHER_SITE, diameterCm: 20 }),
    ]);
  await db.records('collarEvent').bulkPut([
    deviceRecord('collarEvent', { id: 'e1', rev: 1, siteId: SITE, collarId: COLLAR, kind: 'installed', date: '2026-03-02', note: '' }),
    deviceRecord('collarEvent', {
      id: 'e2',
      rev: 1,
      siteId: SITE,
      collarId: COLLAR,
      kind: 'clipped',
      date: '2026-06-10',
      note: 'Grass cut to 2 cm',
    }),
    deviceRecord('collarEvent', {
      id: 'e3',
      rev: 1,
      siteId: SITE,
      collarId: COLLAR,
      kind: 'damaged',
      date: '2026-05-01',
      note: 'gone',
      deleted: true,
    }),
  ]);
  const fixture = TestBed.createComponent(CollarEvents);
  fixture.componentRef.setInput('collarId', COLLAR);
  fixture.componentRef.setInput('siteId', SITE);
  const el = fixture.nativeElement as HTMLElement;
  const items = () => [...el.querySelectorAll('[data-testid="collar-events"] li')].map((li) => li.textContent!.replace(/\s+/g, ' ').trim());
  await until(() => items().length === 2 && items()[0] !== 'No events recorded.', 'the events');
  return { db, fixture, el, items, loader: TestbedHarnessEnvironment.loader(fixture) };
}

describe('CollarEvents', () => {
  afterEach(() => localStorage.clear());

  it('when an event is recorded, then the day offered is today at the collar’s site, not on the device', async () => {
    const { zone, deviceDay } = zoneAwayFromDevice();
    const { el, fixture } = await render(zone);
    const day = el.querySelector<HTMLInputElement>('input[type="date"]')!.value;
    expect(day).toBe(siteToday(zone));
    expect(day).not.toBe(deviceDay);
    fixture.destroy();
  });

  it('when a collar has events, then they are listed newest first, deleted ones left out', async () => {
    const { items, fixture } = await render();
    expect(items()).toEqual(['2026-06-10 Vegetation clipped — Grass cut to 2 cm', '2026-03-02 Installed']);
    fixture.destroy();
  });

  it('when the crew records a reseat with date and note, then the event and its outbox op are on the device and the list shows it', async () => {
    const { db, items, loader, el, fixture } = await render();
    await (await loader.getHarness(MatSelectHarness.with({ selector: 'mat-select' }))).clickOptions({ text: 'Reseated' });
    await (await loader.getHarness(MatInputHarness.with({ selector: 'input[type="date"]' }))).setValue('2026-07-01');
    const note = await loader.getHarness(MatInputHarness.with({ selector: 'textarea' }));
    await note.setValue('Frost heave lifted the rim 1 cm');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Record event' }))).click();

    const saved = await until(async () => (await db.records('collarEvent').toArray()).find((e) => e['kind'] === 'reseated'), 'the event');
    expect(saved).toMatchObject({
      siteId: SITE,
      collarId: COLLAR,
      kind: 'reseated',
      date: '2026-07-01',
      note: 'Frost heave lifted the rim 1 cm',
      replacedById: null,
    });
    const ops = await db.outbox.toArray();
    expect(ops.map((o) => [o.entity, o.id])).toEqual([['collarEvent', saved.id]]);
    await until(() => items().length === 3, 'the new event in the list');
    expect(items()[0]).toBe('2026-07-01 Reseated — Frost heave lifted the rim 1 cm');
    expect(await note.getValue()).toBe('');
    expect(el.querySelector('[role="status"]')?.textContent?.trim()).toBe('Event saved on this device.');
    fixture.destroy();
  });

  it('when a replacement is recorded, then the new collar must be named from the same site, in code order', async () => {
    const { db, loader, el, fixture } = await render();
    await (await loader.getHarness(MatSelectHarness.with({ selector: 'mat-select' }))).clickOptions({ text: 'Replaced by a new collar' });
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Record event' }))).click();
    expect(el.querySelector('[role="alert"]')?.textContent?.trim()).toBe('Name the new collar');
    expect(await db.records('collarEvent').count()).toBe(3);

    const selects = await loader.getAllHarnesses(MatSelectHarness);
    expect(selects).toHaveLength(2);
    await selects[1].open();
    expect(await Promise.all((await selects[1].getOptions()).map((o) => o.getText()))).toEqual(['W-9', 'W-10']);
    await selects[1].clickOptions({ text: 'W-9' });
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Record event' }))).click();
    const saved = await until(
      async () => (await db.records('collarEvent').toArray()).find((e) => e['kind'] === 'replaced'),
      'the replacement',
    );
    expect(saved['replacedById']).toBe(NEW_COLLAR);
    fixture.destroy();
  });
});

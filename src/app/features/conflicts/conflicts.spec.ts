import { provideHttpClient } from '@angular/common/http';
import { provideHttpClientTesting } from '@angular/common/http/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { TestBed } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatRadioGroupHarness } from '@angular/material/radio/testing';
import { provideRouter } from '@angular/router';
import type { FluxDb } from '../../core/db/db-schema';
import { DeviceDb } from '../../core/db/device-db';
import { collar } from '../../core/db/testing/test-db';
import { until } from '../../core/db/testing/until';
import { Conflicts } from './conflicts';

const SITE = '11111111-1111-4111-8111-111111111111';
const A = 'aaaaaaaa-aaaa-4aaa-8aaa-aaaaaaaaaaaa';
const LEAD = '99999999-9999-4999-8999-999999999999';
let userNo = 0;

async function render() {
  const userId = `0000000${++userNo}-0000-4000-8000-00000000000e`.slice(-36);
  localStorage.setItem(
    'fw.session',
    JSON.stringify({
      user: { id: userId, email: 'crew@fluxwalk.example', displayName: 'Crew', roles: ['crew'], siteIds: [SITE] },
      sites: [{ id: SITE, name: 'Test site' }],
    }),
  );
  TestBed.configureTestingModule({ providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting()] });
  const db: FluxDb = await until(() => TestBed.inject(DeviceDb).db(), 'the database');
  await db.records('collar').put(collar(A, 3, { code: 'W-07', notes: 'base', status: 'active' }));
  // My edit of notes and status met the lead's edit of both: the server kept its rev 4.
  await db.conflicts.put({
    opId: 'op-1',
    entity: 'collar',
    recordId: A,
    fields: ['notes', 'status'],
    mine: { notes: 'mine', status: 'damaged', statusReason: 'boar' },
    base: { notes: 'base', status: 'active' },
    theirs: {
      ...collar(A, 4, { code: 'W-07', notes: 'theirs', status: 'retired' }),
      updatedAt: '2026-06-02T08:00:00.000Z',
      updatedBy: LEAD,
    },
    serverRev: 4,
    wasDelete: false,
    at: '2026-06-02T09:00:00.000Z',
  });
  const fixture = TestBed.createComponent(Conflicts);
  const el = fixture.nativeElement as HTMLElement;
  await until(() => el.querySelector('[data-testid="conflict"]'), 'the conflict');
  return { db, fixture, el, loader: TestbedHarnessEnvironment.loader(fixture) };
}

describe('Conflicts', () => {
  afterEach(() => localStorage.clear());

  it('when the person picks per field, then "Use my picks" waits for every field and then queues mine where kept on the server’s rev', async () => {
    const { db, el, loader, fixture } = await render();
    expect([...el.querySelectorAll('[data-testid="mine-value"]')].map((e) => e.textContent)).toEqual(['mine', 'damaged']);
    expect([...el.querySelectorAll('[data-testid="theirs-value"]')].map((e) => e.textContent)).toEqual(['theirs', 'retired']);
    expect(el.querySelector('.who')?.textContent).toContain('by another person (rev 4)');
    const use = await loader.getHarness(MatButtonHarness.with({ text: 'Use my picks' }));
    expect(await use.isDisabled()).toBe(true);

    const [notes, status] = await loader.getAllHarnesses(MatRadioGroupHarness);
    await notes.checkRadioButton({ label: 'Theirs' });
    expect(await use.isDisabled()).toBe(true);
    await status.checkRadioButton({ label: 'Mine' });
    expect(await use.isDisabled()).toBe(false);
    await use.click();

    await until(() => el.querySelector('[data-testid="no-conflicts"]'), 'the conflict settled');
    const [op] = await db.outbox.toArray();
    expect(op).toMatchObject({ entity: 'collar', id: A, baseRev: 4, fields: { status: 'damaged', statusReason: 'boar' } });
    expect(await db.records('collar').get(A)).toMatchObject({ notes: 'theirs', status: 'damaged', rev: 4 });
    fixture.destroy();
  });
});

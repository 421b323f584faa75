import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { TestBed } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { MatSelectHarness } from '@angular/material/select/testing';
import { ActivatedRoute, Router, convertToParamMap, provideRouter } from '@angular/router';
import type { FluxDb } from '../../core/db/db-schema';
import { siteToday } from '../../../../shared/time/site-time';
import { signedInDevice, TEST_SITE, zoneAwayFromDevice } from '../../core/db/testing/signed-in-device';
import { until } from '../../core/db/testing/until';
import { InstallPage } from './install-page';

const PLOT = '22222222-2222-4222-8222-222222222222';
const OLD_COLLAR = '33333333-3333-4333-8333-333333333333';
const BLANK_TAG = '9e8d7c6b-5a49-4382-a716-0f1e2d3c4b5a';

/** The install screen on a device holding one plot and one collar (N-01) and what `before` adds; `query` as in the address. */
async function render(
  query: Record<string, string> = {},
  before: (db: FluxDb) => Promise<void> = async () => undefined,
  timezone?: string,
) {
  const { db } = await signedInDevice(
    [provideRouter([]), { provide: ActivatedRoute, useValue: { snapshot: { queryParamMap: convertToParamMap(query) } } }],
    timezone ? { timezone } : {},
  );
  await db.records('site').put({ id: TEST_SITE, rev: 1, name: 'Test site' });
  await db.records('plot').put({ id: PLOT, rev: 1, siteId: TEST_SITE, code: 'P1' });
  await db.records('collar').put({ id: OLD_COLLAR, rev: 1, siteId: TEST_SITE, plotId: PLOT, code: 'N-01', deleted: false });
  await before(db);
  const navigated: unknown[] = [];
  jest.spyOn(TestBed.inject(Router), 'navigate').mockImplementation(async (cmds) => {
    navigated.push(cmds);
    return true;
  });
  const fixture = TestBed.createComponent(InstallPage);
  const loader = TestbedHarnessEnvironment.loader(fixture);
  const el = fixture.nativeElement as HTMLElement;
  const text = (id: string) => el.querySelector(`[data-testid="${id}"]`)?.textContent?.trim() ?? '';
  await until(() => fixture.componentInstance['plots']().length > 0, 'the plots from the device');
  return { db, fixture, loader, el, text, navigated };
}

async function fillAndSave(loader: ReturnType<typeof TestbedHarnessEnvironment.loader>) {
  await (await loader.getHarness(MatSelectHarness.with({ selector: '[data-testid="install-plot"]' }))).clickOptions({ text: 'P1' });
  await (await loader.getHarness(MatInputHarness.with({ selector: '[data-testid="install-diameter"]' }))).setValue('20');
  await (await loader.getHarness(MatButtonHarness.with({ text: 'Save the new collar' }))).click();
}

const collars = (db: FluxDb) => db.records('collar').toArray();

describe('Install screen with a printed tag', () => {
  afterEach(() => localStorage.clear());

  it("when a blank tag led here, then its planned code fills in and the saved collar takes the tag's id", async () => {
    const { db, loader, text, navigated } = await render({ tag: BLANK_TAG, code: 'N-07' });
    await until(() => text('install-tag').startsWith('Tag 9e8d7c6b'), 'the adopted tag');
    expect(await (await loader.getHarness(MatInputHarness.with({ selector: '[data-testid="install-code"]' }))).getValue()).toBe('N-07');
    expect(text('install-tag-note')).toContain('If it is already on a collar, sync first');
    await fillAndSave(loader);
    const saved = await until(async () => (await db.records('collar').get(BLANK_TAG)) ?? null, 'the new collar');
    expect(saved).toMatchObject({ code: 'N-07', plotId: PLOT, siteId: TEST_SITE, diameterCm: 20 });
    const ops = await db.outbox.toArray();
    expect(ops.filter((o) => o.entity === 'collar').map((o) => o.id)).toEqual([BLANK_TAG]);
    expect(navigated).toEqual([['/collars', BLANK_TAG]]);
  });

  it('when the scanned tag is already on a collar of this device, then it is refused and the collar gets an id of its own', async () => {
    const { db, loader, text, el } = await render({ tag: OLD_COLLAR });
    await until(() => text('install-tag-note').includes('already on collar N-01'), 'the refusal');
    expect(el.querySelector('[data-testid="install-tag"]')).toBeNull();
    await (await loader.getHarness(MatInputHarness.with({ selector: '[data-testid="install-code"]' }))).setValue('N-02');
    await fillAndSave(loader);
    const made = await until(async () => (await collars(db)).find((c) => c.code === 'N-02'), 'the new collar');
    expect(made.id).not.toBe(OLD_COLLAR);
    expect((await db.records('collar').get(OLD_COLLAR))!['code']).toBe('N-01');
  });

  it('when the scanned tag belonged to a deleted collar, then it is refused with that reason', async () => {
    const { text, el } = await render({ tag: BLANK_TAG }, async (db) => {
      await db.records('collar').put({ id: BLANK_TAG, rev: 3, siteId: TEST_SITE, plotId: PLOT, code: 'N-05', deleted: true });
    });
    await until(() => text('install-tag-note').includes('belonged to collar N-05, since deleted'), 'the refusal');
    expect(el.querySelector('[data-testid="install-tag"]')).toBeNull();
  });

  it('when the code is already used at the site, then nothing is saved and the crew is told to choose another', async () => {
    const { db, loader, el } = await render();
    await (await loader.getHarness(MatInputHarness.with({ selector: '[data-testid="install-code"]' }))).setValue('n-01');
    await fillAndSave(loader);
    await until(() => el.querySelector('.problem')?.textContent?.includes('already used at this site'), 'the problem');
    expect(await collars(db)).toHaveLength(1);
    expect(await db.outbox.count()).toBe(0);
  });
});

describe('Install screen: the site’s day', () => {
  afterEach(() => localStorage.clear());

  it('when a collar is installed, then the install day offered is today at the site, not on the device', async () => {
    const { zone, deviceDay } = zoneAwayFromDevice();
    const { el } = await render({}, async () => undefined, zone);
    const day = el.querySelector<HTMLInputElement>('input[type="date"]')!.value;
    expect(day).toBe(siteToday(zone));
    expect(day).not.toBe(deviceDay);
  });
});

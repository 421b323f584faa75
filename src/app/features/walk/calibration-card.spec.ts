import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { TestBed } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import type { FluxDb } from '../../core/db/db-schema';
import { signedInDevice, TEST_SITE } from '../../core/db/testing/signed-in-device';
import { until } from '../../core/db/testing/until';
import { CalibrationCard } from './calibration-card';

const ANALYZER = {
  id: 'a1111111-1111-4111-8111-111111111111',
  rev: 1,
  updatedAt: '2026-01-01T00:00:00Z',
  updatedBy: null,
  deleted: false,
  siteId: TEST_SITE,
  name: 'Unit 7',
  serial: 'U7',
  rangeMinPpm: 0,
  rangeMaxPpm: 3000,
  precisionPpm: 1,
  calibrationIntervalDays: 30,
};
const daysAgo = (d: number) => new Date(Date.now() - d * 86_400_000 - 3_600_000).toISOString();

async function render(before: (db: FluxDb) => Promise<void> = async () => undefined) {
  const { db, userId } = await signedInDevice();
  await before(db);
  const fixture = TestBed.createComponent(CalibrationCard);
  fixture.componentRef.setInput('siteId', TEST_SITE);
  fixture.componentRef.setInput('analyzer', ANALYZER);
  fixture.componentRef.setInput('driftLimitPct', 2);
  fixture.componentRef.setInput('timeZone', 'UTC');
  const loader = TestbedHarnessEnvironment.loader(fixture);
  const el = fixture.nativeElement as HTMLElement;
  const text = (id: string) => {
    fixture.detectChanges();
    return el.querySelector(`[data-testid="${id}"]`)?.textContent?.replace(/\s+/g, ' ').trim() ?? '';
  };
  return { db, userId, fixture, loader, el, text };
}

const calibration = (at: string) => ({
  id: crypto.randomUUID(),
  rev: 1,
  siteId: TEST_SITE,
  analyzerId: ANALYZER.id,
  kind: 'calibration',
  at,
  skipped: false,
  passed: true,
  spanGasPpm: 1000,
  driftPpm: 4,
  deleted: false,
});

describe('Walk: the calibration card at the start of the day', () => {
  afterEach(() => localStorage.clear());

  it('when the analyzer has never been calibrated, then the card says so; a calibration recorded goes to the store and the outbox', async () => {
    const { db, loader, text } = await render();
    await until(() => text('calibration-status') === 'No calibration of Unit 7 on record', 'the empty status');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Record a calibration…' }))).click();
    const type = async (id: string, v: string) =>
      (await loader.getHarness(MatInputHarness.with({ selector: `[data-testid="${id}"]` }))).setValue(v);
    expect(text('cylinder-caution')).toContain("follow the supplier's handling rules");
    await type('cal-at', '2026-07-10T06:40');
    await type('cal-zero-before', '-1.5');
    await type('cal-zero-after', '0');
    await type('cal-span-gas', '2000');
    await type('cal-span-cylinder', 'SG-2000-11');
    await type('cal-span-before', '1978');
    await type('cal-span-after', '1999.5');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Save calibration' }))).click();
    const saved = await until(async () => (await db.records('analyzerCheck').toArray())[0] ?? null, 'the saved calibration');
    expect(saved).toMatchObject({
      siteId: TEST_SITE,
      analyzerId: ANALYZER.id,
      kind: 'calibration',
      at: '2026-07-10T06:40:00.000Z',
      passed: true,
      zeroGasPpm: 0,
      zeroCylinder: null,
      zeroBeforePpm: -1.5,
      zeroDriftPpm: -1.5,
      spanGasPpm: 2000,
      spanCylinder: 'SG-2000-11',
      driftPpm: -22,
    });
    const ops = await db.outbox.toArray();
    expect(ops.map((o) => [o.entity, o.id])).toEqual([['analyzerCheck', saved.id]]);
    await until(() => text('calibration-status').startsWith('Last calibrated 2026-07-10 06:40'), 'the new status');
    expect(text('calibration-card')).toContain('Calibration of Unit 7 saved on this device.');
  });

  it("when the last calibration is older than the analyzer's interval, then it is shown as overdue with its age", async () => {
    const { text } = await render(async (db) => {
      await db.records('analyzerCheck').bulkPut([calibration(daysAgo(45)), calibration(daysAgo(400))]);
    });
    await until(() => text('calibration-status').includes('45 days ago'), 'the status');
    expect(text('calibration-status')).toMatch(
      /^Last calibrated \d{4}-\d\d-\d\d \d\d:\d\d [A-Z][A-Za-z0-9+:-]* \(45 days ago; due every 30 days\): overdue · span drift 4 µmol\/mol$/,
    );
  });

  it('when the last calibration is within the interval, then it is not overdue', async () => {
    const { text, el } = await render(async (db) => {
      await db.records('analyzerCheck').put(calibration(daysAgo(3)));
    });
    await until(() => text('calibration-status').includes('3 days ago; due every 30 days)'), 'the status');
    expect(el.querySelector('[data-testid="calibration-status"]')!.classList.contains('ok')).toBe(true);
  });
});

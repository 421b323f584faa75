import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting, type TestRequest } from '@angular/common/http/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { TestBed } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { MatSelectHarness } from '@angular/material/select/testing';
import { MatSortHarness } from '@angular/material/sort/testing';
import { MatTableHarness } from '@angular/material/table/testing';
import { siteTime } from '../calibration/site-clock';
import { AnalyzerChecks } from './analyzer-checks';

const SITE = '0b5e7d2c-1111-4a4a-8a8a-000000000001';
const A1 = { id: 'a0000000-0000-4000-8000-000000000001', rev: 1, siteId: SITE, name: 'Field unit 1', serial: 'FU-0193' };
const A2 = { id: 'a0000000-0000-4000-8000-000000000002', rev: 1, siteId: SITE, name: 'Field unit 2', serial: '' };
const ASH = 'u0000000-0000-4000-8000-000000000007';
const check = (n: number, fields: Record<string, unknown>) => ({
  id: `c0000000-0000-4000-8000-00000000000${n}`,
  rev: 1,
  siteId: SITE,
  analyzerId: A1.id,
  skipped: false,
  skipReason: null,
  passed: null,
  updatedBy: ASH,
  ...fields,
});
const A1_CHECKS = [
  check(1, { kind: 'leak', at: '2026-05-04T05:10:00.000Z', passed: true }),
  check(2, { kind: 'calibration', at: '2026-05-06T04:55:00.000Z', skipped: true, skipReason: 'Span gas bottle empty' }),
  check(3, { kind: 'ambient', at: '2026-05-05T05:02:00.000Z', passed: false, updatedBy: 'u0000000-0000-4000-8000-000000000099' }),
];

const LEAK_FILE = {
  id: 'f0000000-0000-4000-8000-000000000001',
  rev: 2,
  siteId: SITE,
  ownerEntity: 'analyzerCheck',
  ownerId: A1_CHECKS[0]!.id,
  fileName: 'plate.csv',
  mediaType: 'text/csv',
  objectKey: 'sites/x/attachments/f',
};

/**
 * The one open request that matches, waited for: a list loaded again after a save is asked for at
 * the next change detection, a turn or more after the save's answer.
 */
async function nextRequest(backend: HttpTestingController, url: string): Promise<TestRequest> {
  for (let i = 0; i < 100; i++) {
    const [req] = backend.match((r) => r.method === 'GET' && r.url === url);
    if (req) return req;
    await new Promise((r) => setTimeout(r, 0));
  }
  throw new Error(`no request for ${url}`);
}

async function checksOf() {
  TestBed.configureTestingModule({ imports: [AnalyzerChecks], providers: [provideHttpClient(), provideHttpClientTesting()] });
  const fixture = TestBed.createComponent(AnalyzerChecks);
  fixture.componentRef.setInput('siteId', SITE);
  fixture.componentRef.setInput('analyzers', [A1, A2]);
  fixture.componentRef.setInput('timeZone', 'Europe/Berlin');
  fixture.componentRef.setInput('driftLimitPct', 2);
  fixture.detectChanges();
  const backend = TestBed.inject(HttpTestingController);
  backend
    .expectOne('/api/users')
    .flush({ items: [{ id: ASH, email: 'r@example.org', displayName: 'Rowan Ashby', roles: ['crew'], siteIds: [SITE] }] });
  const req = backend.expectOne((r) => r.url === '/api/analyzer-checks');
  expect([req.request.params.get('analyzerId'), req.request.params.get('siteId')]).toEqual([A1.id, SITE]);
  req.flush({ items: A1_CHECKS, total: 3, limit: 1000, offset: 0 });
  const files = backend.expectOne((r) => r.url === '/api/attachments');
  expect([files.request.params.get('ownerEntity'), files.request.params.get('siteId')]).toEqual(['analyzerCheck', SITE]);
  files.flush({ items: [LEAK_FILE], total: 1, limit: 1000, offset: 0 });
  await new Promise((r) => setTimeout(r, 0));
  await fixture.whenStable();
  const loader = TestbedHarnessEnvironment.loader(fixture);
  return { fixture, backend, loader, grid: await loader.getHarness(MatTableHarness) };
}

describe('AnalyzerChecks', () => {
  it('when an analyzer has checks, then each shows kind, site-local time, who, the result and its file, newest first', async () => {
    const { fixture, grid } = await checksOf();
    expect(await grid.getCellTextByIndex()).toEqual([
      ['Calibration', '2026-05-06 06:55 CEST', 'Rowan Ashby', 'Skipped: Span gas bottle empty', ''],
      ['Ambient reading', '2026-05-05 07:02 CEST', 'a former user', 'Failed', ''],
      ['Leak check', '2026-05-04 07:10 CEST', 'Rowan Ashby', 'Passed', 'plate.csv'],
    ]);
    const link = (fixture.nativeElement as HTMLElement).querySelector<HTMLAnchorElement>('td a[download]')!;
    expect([link.getAttribute('href'), link.getAttribute('download')]).toEqual([`/api/attachments/${LEAK_FILE.id}/content`, 'plate.csv']);
  });

  it('when the Check header is clicked, then rows sort by kind', async () => {
    const { loader, grid } = await checksOf();
    const [kind] = await (await loader.getHarness(MatSortHarness)).getSortHeaders();
    await kind!.click();
    expect((await grid.getCellTextByColumnName())['kind']!.text).toEqual(['Ambient reading', 'Calibration', 'Leak check']);
  });

  it('when another analyzer is chosen, then its own checks are asked for and an empty list says so', async () => {
    const { fixture, backend, loader, grid } = await checksOf();
    await (await loader.getHarness(MatSelectHarness)).open();
    // A plain click: a harness click waits for the page to settle, which it does only once the requests below are answered.
    [...document.querySelectorAll<HTMLElement>('mat-option')].find((o) => o.textContent?.includes('Field unit 2'))!.click();
    fixture.detectChanges();
    const req = await nextRequest(backend, '/api/analyzer-checks');
    expect(req.request.params.get('analyzerId')).toBe(A2.id);
    req.flush({ items: [], total: 0, limit: 1000, offset: 0 });
    (await nextRequest(backend, '/api/attachments')).flush({ items: [], total: 0, limit: 1000, offset: 0 });
    await new Promise((r) => setTimeout(r, 0));
    await fixture.whenStable();
    expect(await grid.getRows()).toHaveLength(0);
    expect((fixture.nativeElement as HTMLElement).querySelector('.empty')!.textContent!.trim()).toBe(
      'No checks recorded for this analyzer.',
    );
  });

  it('when the admin records a calibration, then it is posted for the chosen analyzer in UTC and the list shows its drift', async () => {
    const { fixture, backend, loader, grid } = await checksOf();
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Record a calibration…' }))).click();
    expect((fixture.nativeElement as HTMLElement).querySelector('[data-testid="cylinder-caution"]')!.textContent).toContain(
      "follow the supplier's handling rules",
    );
    const type = async (id: string, v: string) =>
      (await loader.getHarness(MatInputHarness.with({ selector: `[data-testid="${id}"]` }))).setValue(v);
    await type('cal-at', '2026-06-12T09:15');
    await type('cal-zero-gas', '0');
    await type('cal-zero-cylinder', 'N2-77');
    await type('cal-zero-before', '3');
    await type('cal-zero-after', '0.2');
    await type('cal-span-gas', '800');
    await type('cal-span-cylinder', 'SG-800-5');
    await type('cal-span-before', '790');
    await type('cal-span-after', '800.1');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Save calibration' }))).click();
    const post = backend.expectOne((r) => r.method === 'POST' && r.url === '/api/analyzer-checks');
    // 09:15 in Berlin in June is UTC+2 (EU summer time).
    expect(post.request.body).toEqual({
      siteId: SITE,
      analyzerId: A1.id,
      kind: 'calibration',
      at: '2026-06-12T07:15:00.000Z',
      zeroGasPpm: 0,
      zeroCylinder: 'N2-77',
      zeroBeforePpm: 3,
      zeroAfterPpm: 0.2,
      spanGasPpm: 800,
      spanCylinder: 'SG-800-5',
      spanBeforePpm: 790,
      spanAfterPpm: 800.1,
      passed: true,
      note: '',
    });
    const stored = check(4, { ...post.request.body, zeroDriftPpm: 3, driftPpm: -10, passed: true });
    post.flush({ record: stored });
    (await nextRequest(backend, '/api/analyzer-checks')).flush({ items: [stored, ...A1_CHECKS], total: 4, limit: 1000, offset: 0 });
    (await nextRequest(backend, '/api/attachments')).flush({ items: [], total: 0, limit: 1000, offset: 0 });
    await new Promise((r) => setTimeout(r, 0));
    await fixture.whenStable();
    expect((await grid.getCellTextByIndex())[0]).toEqual([
      'Calibration',
      '2026-06-12 09:15 CEST',
      'Rowan Ashby',
      'Passed · drift zero +3, span -10 µmol/mol (1.25 %) · span gas 800 µmol/mol (SG-800-5)',
      '',
    ]);
    expect((fixture.nativeElement as HTMLElement).querySelector('[data-testid="checks-message"]')!.textContent).toContain(
      'Calibration of Field unit 1 saved.',
    );
  });

  it('when the server refuses a calibration, then its message shows and the form stays open with what was typed', async () => {
    const { fixture, backend, loader } = await checksOf();
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Record a calibration…' }))).click();
    const type = async (id: string, v: string) =>
      (await loader.getHarness(MatInputHarness.with({ selector: `[data-testid="${id}"]` }))).setValue(v);
    for (const [id, v] of [
      ['cal-zero-before', '1'],
      ['cal-zero-after', '0'],
      ['cal-span-gas', '800'],
      ['cal-span-cylinder', 'SG-800-5'],
      ['cal-span-before', '801'],
      ['cal-span-after', '800'],
    ])
      await type(id!, v!);
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Save calibration' }))).click();
    backend
      .expectOne((r) => r.method === 'POST')
      .flush({ error: { message: 'You are not a member of this site', fields: [] } }, { status: 403, statusText: 'Forbidden' });
    await new Promise((r) => setTimeout(r, 0));
    await fixture.whenStable();
    expect((fixture.nativeElement as HTMLElement).querySelector('[data-testid="checks-message"]')!.textContent).toContain(
      'You are not a member of this site',
    );
    expect(await (await loader.getHarness(MatInputHarness.with({ selector: '[data-testid="cal-span-cylinder"]' }))).getValue()).toBe(
      'SG-800-5',
    );
  });

  it('when a time is shown, then it is the wall-clock time of the site, across the change to summer time', () => {
    // Europe/Berlin moves from UTC+1 to UTC+2 at 01:00 UTC on 29 March 2026 (EU Directive 2000/84/EC: last Sunday of March).
    expect(siteTime('2026-03-29T00:30:00Z', 'Europe/Berlin')).toBe('2026-03-29 01:30 CET');
    expect(siteTime('2026-03-29T01:30:00Z', 'Europe/Berlin')).toBe('2026-03-29 03:30 CEST');
  });
});

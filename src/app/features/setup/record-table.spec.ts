import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { TestBed } from '@angular/core/testing';
import { MatFormFieldHarness } from '@angular/material/form-field/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { MatPaginatorHarness } from '@angular/material/paginator/testing';
import { MatSortHarness } from '@angular/material/sort/testing';
import { MatTableHarness } from '@angular/material/table/testing';
import type { ColumnDef } from './record-fields';
import { RecordTable } from './record-table';

const SITE = '0b5e7d2c-1111-4a4a-8a8a-000000000001';
const columns: ColumnDef[] = [
  { key: 'code', label: 'Plot code', kind: 'text' },
  { key: 'areaM2', label: 'Area (m²)', kind: 'number' },
];
// 30 plots named out of order: P01…P30, with areas that sort differently from the codes.
const plots = Array.from({ length: 30 }, (_, i) => ({
  id: `00000000-0000-4000-8000-${String(i + 1).padStart(12, '0')}`,
  rev: 1,
  siteId: SITE,
  code: `P${String(((i * 7) % 30) + 1).padStart(2, '0')}`,
  areaM2: (i * 13) % 30,
}));

async function table() {
  TestBed.configureTestingModule({ imports: [RecordTable], providers: [provideHttpClient(), provideHttpClientTesting()] });
  const fixture = TestBed.createComponent(RecordTable);
  fixture.componentRef.setInput('entity', 'plot');
  fixture.componentRef.setInput('title', 'Plots');
  fixture.componentRef.setInput('siteId', SITE);
  fixture.componentRef.setInput('columns', columns);
  fixture.detectChanges();
  const req = TestBed.inject(HttpTestingController).expectOne((r) => r.url === '/api/plots');
  expect(req.request.params.get('siteId')).toBe(SITE);
  req.flush({ items: plots, total: plots.length, limit: 1000, offset: 0 });
  await fixture.whenStable();
  const loader = TestbedHarnessEnvironment.loader(fixture);
  return { fixture, loader, grid: await loader.getHarness(MatTableHarness) };
}

const firstColumn = async (grid: MatTableHarness) => (await grid.getCellTextByColumnName())['code']!.text;

describe('RecordTable', () => {
  it('when 30 rows load, then the first page shows 25 and the paginator reaches the other 5', async () => {
    const { loader, grid } = await table();
    expect(await grid.getRows()).toHaveLength(25);
    const pages = await loader.getHarness(MatPaginatorHarness);
    expect(await pages.getRangeLabel()).toBe('1 – 25 of 30');
    await pages.goToNextPage();
    expect(await grid.getRows()).toHaveLength(5);
  });

  it('when the code header is clicked, then rows sort by code both ways; a number column sorts as numbers', async () => {
    const { loader, grid } = await table();
    const sort = await loader.getHarness(MatSortHarness);
    const [code, area] = await sort.getSortHeaders();
    await code!.click();
    expect((await firstColumn(grid)).slice(0, 3)).toEqual(['P01', 'P02', 'P03']);
    await code!.click();
    expect((await firstColumn(grid)).slice(0, 3)).toEqual(['P30', 'P29', 'P28']);
    await area!.click();
    // Areas are 0…29 once each: numeric order puts 0, 1, 2 first (text order would put 10 before 2).
    expect((await grid.getCellTextByColumnName())['areaM2']!.text.slice(0, 4)).toEqual(['0', '1', '2', '3']);
  });

  it('when a filter is typed, then only matching rows remain and the paginator counts them', async () => {
    const { loader, grid } = await table();
    const field = await loader.getHarness(MatFormFieldHarness.with({ floatingLabelText: 'Filter plots' }));
    await ((await field.getControl(MatInputHarness)) as MatInputHarness).setValue('P1');
    expect([...(await firstColumn(grid))].sort()).toEqual(['P10', 'P11', 'P12', 'P13', 'P14', 'P15', 'P16', 'P17', 'P18', 'P19']);
    expect(await (await loader.getHarness(MatPaginatorHarness)).getRangeLabel()).toBe('1 – 10 of 10');
  });
});

describe('RecordTable: adding a row', () => {
  it('when a select is left alone, then the default given to the table is sent, not "none"; the typed fields are sent as their types', async () => {
    TestBed.configureTestingModule({ imports: [RecordTable], providers: [provideHttpClient(), provideHttpClientTesting()] });
    const fixture = TestBed.createComponent(RecordTable);
    fixture.componentRef.setInput('entity', 'treatment');
    fixture.componentRef.setInput('title', 'Treatments');
    fixture.componentRef.setInput('siteId', SITE);
    fixture.componentRef.setInput('columns', [
      { key: 'code', label: 'Treatment code', kind: 'text' },
      {
        key: 'level',
        label: 'Applied to',
        kind: 'select',
        options: () => [
          { value: 'plot', label: 'Whole plots' },
          { value: 'collar', label: 'Single collars' },
        ],
      },
    ] satisfies ColumnDef[]);
    fixture.componentRef.setInput('defaults', { level: 'plot' });
    fixture.detectChanges();
    const backend = TestBed.inject(HttpTestingController);
    backend.expectOne((r) => r.url === '/api/treatments').flush({ items: [], total: 0, limit: 1000, offset: 0 });
    await fixture.whenStable();
    const loader = TestbedHarnessEnvironment.loader(fixture);
    const code = await loader.getHarness(MatFormFieldHarness.with({ floatingLabelText: 'Treatment code' }));
    await ((await code.getControl(MatInputHarness)) as MatInputHarness).setValue('TR');
    (fixture.nativeElement as HTMLElement).querySelector<HTMLFormElement>('form.add-row')!.dispatchEvent(new Event('submit'));
    const post = backend.expectOne((r) => r.method === 'POST' && r.url === '/api/treatments');
    expect(post.request.body).toEqual({ level: 'plot', siteId: SITE, code: 'TR' });
  });
});

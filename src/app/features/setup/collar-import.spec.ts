import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { TestBed } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { MatSelectHarness } from '@angular/material/select/testing';
import { CollarImport } from './collar-import';
import type { ImportPreview } from './setup-api';

const SITE = '0b5e7d2c-1111-4a4a-8a8a-000000000001';
const CSV = 'code,plot,diameter_cm\nC1,P1,20\nC2,P1,abc\n';
const settle = () => new Promise((r) => setTimeout(r, 0));

/** The server's check of CSV: row 3's diameter is not a number; code and diameter were matched to headers, notes not. */
const PREVIEW: ImportPreview = {
  headers: ['code', 'plot', 'diameter_cm'],
  mapping: { code: 'code', plotCode: 'plot', diameterCm: 'diameter_cm' },
  targets: {
    code: { label: 'Collar code', unit: null, required: true },
    plotCode: { label: 'Plot code', unit: null, required: true },
    diameterCm: { label: 'Diameter', unit: 'cm', required: false },
    notes: { label: 'Notes', unit: null, required: false },
  },
  rows: [
    { row: 2, cells: {}, errors: [] },
    { row: 3, cells: {}, errors: [{ row: 3, column: 'diameter_cm', message: 'Collar diameter must be a number' }] },
  ],
  fileErrors: [],
  validRows: 1,
  errorRows: 1,
};

describe('CollarImport', () => {
  it('when a named cell is fixed and one column unmapped, then the next check sends the fixed file, the resolved mapping and the change', async () => {
    TestBed.configureTestingModule({ imports: [CollarImport], providers: [provideHttpClient(), provideHttpClientTesting()] });
    const fixture = TestBed.createComponent(CollarImport);
    fixture.componentRef.setInput('siteId', SITE);
    fixture.detectChanges();
    const backend = TestBed.inject(HttpTestingController);
    const input = (fixture.nativeElement as HTMLElement).querySelector<HTMLInputElement>('[data-testid=collar-csv-input]')!;
    Object.defineProperty(input, 'files', { value: [new File([CSV], 'collars.csv', { type: 'text/csv' })] });
    input.dispatchEvent(new Event('change'));
    // The file is read before it is sent, which may take more than a turn on a busy machine.
    const isPreview = (r: { url: string }) => r.url === `/api/sites/${SITE}/collar-import/preview`;
    let [first] = backend.match(isPreview);
    for (let i = 0; i < 100 && !first; i++) {
      await settle();
      [first] = backend.match(isPreview);
    }
    if (!first) throw new Error('the file was never sent for a check');
    expect(first.request.body.mapping).toEqual({}); // the server guesses every column the first time
    first.flush(PREVIEW);
    await settle();
    await fixture.whenStable();
    const loader = TestbedHarnessEnvironment.loader(fixture);

    await (await loader.getHarness(MatInputHarness.with({ selector: '[aria-label="Row 3 diameter_cm"]' }))).setValue('21.5');
    const diameter = await loader.getHarness(MatSelectHarness.with({ selector: '.mapping mat-form-field:nth-child(3) mat-select' }));
    expect(await diameter.getValueText()).toBe('diameter_cm');
    await diameter.clickOptions({ text: '(not in the file)' });
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Check again' }))).click();

    const again = backend.expectOne((r) => r.url === `/api/sites/${SITE}/collar-import/preview`);
    expect(again.request.body).toEqual({
      csv: 'code,plot,diameter_cm\r\nC1,P1,20\r\nC2,P1,21.5',
      // Notes was never resolved nor set: left out, so the server may still guess it.
      mapping: { code: 'code', plotCode: 'plot', diameterCm: '' },
    });
  });
});

// The dialog reads files in a module Web Worker (import.meta, not loadable under CommonJS jest):
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
import { MatCheckboxHarness } from '@angular/material/checkbox/testing';
import { MatFormFieldHarness } from '@angular/material/form-field/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { MatSelectHarness } from '@angular/material/select/testing';
import { MAT_DIALOG_DATA, MatDialogRef } from '@angular/material/dialog';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import type { LoggerMapping } from '../../../../shared/logger';
import type { FluxDb } from '../../core/db/db-schema';
import { DeviceDb } from '../../core/db/device-db';
import { LoggerImport, type LoggerImportData } from './logger-import';
import { until } from '../../core/db/testing/until';
import { deviceRecord } from '../../core/db/testing/test-db';

const SITE = '11111111-1111-4111-8111-111111111111';
const CAMPAIGN = '44444444-4444-4444-8444-444444444444';
const ANALYZER = '77777777-7777-4777-8777-777777777777';
// Two preamble lines, ";" and decimal comma, DD.MM.YYYY wall times in Europe/Berlin (test/fixtures/logger/README.md).
const FILE = readFileSync(join(__dirname, '../../../../test/fixtures/logger/semicolon-decimal-comma.csv'), 'utf8');
let userNo = 0;

async function render() {
  const userId = `0000000${++userNo}-0000-4000-8000-00000000000d`.slice(-36);
  localStorage.setItem(
    'fw.session',
    JSON.stringify({
      user: { id: userId, email: 'crew@fluxwalk.example', displayName: 'Crew', roles: ['crew'], siteIds: [SITE] },
      sites: [{ id: SITE, name: 'Test site' }],
    }),
  );
  const data: LoggerImportData = { siteId: SITE, campaignId: CAMPAIGN, round: 1, analyzerId: ANALYZER };
  TestBed.configureTestingModule({
    imports: [LoggerImport],
    providers: [
      provideHttpClient(),
      provideHttpClientTesting(),
      { provide: MAT_DIALOG_DATA, useValue: data },
      { provide: MatDialogRef, useValue: { close: jest.fn() } },
    ],
  });
  const db: FluxDb = await until(() => TestBed.inject(DeviceDb).db(), 'the database');
  await db.records('site').put(deviceRecord('site', { id: SITE, rev: 1, name: 'Test site', timezone: 'Europe/Berlin', elevationM: null }));
  const fixture = TestBed.createComponent(LoggerImport);
  const el = fixture.nativeElement as HTMLElement;
  const text = (sel: string) => el.querySelector(sel)?.textContent?.replace(/\s+/g, ' ').trim() ?? '';
  const loader = TestbedHarnessEnvironment.loader(fixture);
  const select = async (label: string) => {
    const field = await loader.getHarness(MatFormFieldHarness.with({ floatingLabelText: label }));
    return (await field.getControl(MatSelectHarness))!;
  };
  const shown = async (label: string) => (await select(label)).getValueText();
  const choose = async (label: string, option: string) => {
    const s = await select(label);
    await s.open();
    await s.clickOptions({ text: option });
  };
  const pick = async (content: string, name = 'day.csv') => {
    const input = await until(() => el.querySelector<HTMLInputElement>('input[type="file"]'), 'the file input');
    const file = { name, size: content.length, text: async () => content };
    Object.defineProperty(input, 'files', { value: [file], configurable: true });
    input.dispatchEvent(new Event('change'));
    await until(() => el.querySelector('[data-testid="layout"]'), 'the mapping step');
    // ngModel writes the selects' values on the next tick.
    await fixture.whenStable();
  };
  return { fixture, el, text, shown, choose, pick, loader };
}

describe('Logger import, mapping step', () => {
  afterEach(() => localStorage.clear());

  it('when a file with a preamble, ";" and decimal commas is chosen, then the layout and our plain column names are recognised and offered for confirmation', async () => {
    const { el, text, shown, pick } = await render();
    await pick(FILE);
    expect(text('[data-testid="layout"]')).toBe('Delimiter: ; · decimal comma · header on line 3');
    expect(await shown('Time column')).toBe('timestamp');
    expect(await shown('Time is')).toBe('a timestamp');
    expect(await shown('CO2 column')).toBe('co2_ppm');
    expect(await shown('CO2 unit')).toBe('µmol/mol (ppm)');
    expect(await shown('H2O column')).toBe('h2o_mmol_mol');
    expect(await shown('Pressure column')).toBe('pressure_kpa');
    expect(await shown('Chamber air temperature column')).toBe('temp_c');
    expect(await shown('Closure id column')).toBe('none (split by the taps, else by gaps)');
    // Every choice is a Material select (touch-sized), none a native dropdown.
    expect(el.querySelectorAll('select')).toHaveLength(0);
    expect(el.querySelectorAll('mat-select').length).toBeGreaterThanOrEqual(10);
  });

  it('when the timestamp format does not fit, then every line is reported; with the format the crew chooses, the file reads and the mapping is kept for the analyzer', async () => {
    const first = await render();
    await first.pick(FILE);
    await (await first.loader.getHarness(MatButtonHarness.with({ text: 'Read the file' }))).click();
    // The mapping step stays, with the reason: no sample could be read with YYYY-MM-DD.
    const dataLines = FILE.trim().split(/\r?\n/).length - 3;
    await until(() => first.text('[data-testid="read-summary"]') || first.text('[role="alert"]'), 'the read');
    expect(first.text('[data-testid="read-summary"]')).toBe('0 samples in 0 closures (split by gaps)');
    expect(first.text('.problems summary')).toBe(`${dataLines} lines could not be read and were left out`);
    TestBed.resetTestingModule();

    const { text, choose, pick, loader } = await render();
    await pick(FILE);
    await choose('Format', 'DD.MM.YYYY HH:mm:ss');
    await choose('Pressure unit', 'hPa');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Read the file' }))).click();
    await until(() => text('[data-testid="read-summary"]'), 'the review step');
    expect(text('[data-testid="read-summary"]')).toBe(`${dataLines} samples in 1 closure (split by gaps)`);
    expect(text('.problems')).toBe('');
    const preset = JSON.parse(localStorage.getItem(`fw.logger-preset.${ANALYZER}`) ?? 'null') as LoggerMapping | null;
    expect(preset).toMatchObject({
      delimiter: ';',
      decimalComma: true,
      headerRow: 2,
      time: { kind: 'timestamp', format: 'DD.MM.YYYY HH:mm:ss', timeZone: 'Europe/Berlin' },
      pressure: { unit: 'hPa' },
    });
    TestBed.resetTestingModule();

    // The same analyzer's next file opens with the remembered mapping.
    const again = await render();
    await again.pick(FILE);
    expect(await again.shown('Format')).toBe('DD.MM.YYYY HH:mm:ss');
    expect(await again.shown('Pressure unit')).toBe('hPa');
  });
});

describe('Logger import, the time column', () => {
  afterEach(() => localStorage.clear());
  it('when the crew switches the time to elapsed and back, then each starts from its usual settings: seconds, then the first format in the site zone', async () => {
    const { shown, choose, pick, loader } = await render();
    await pick(FILE);
    await choose('Format', 'DD.MM.YYYY HH:mm:ss');
    await choose('Time is', 'elapsed time');
    expect(await shown('Unit')).toBe('s');
    await choose('Unit', 'min');
    await choose('Time is', 'a timestamp');
    expect(await shown('Format')).toBe('YYYY-MM-DD HH:mm:ss');
    const zone = await (await loader.getHarness(MatFormFieldHarness.with({ floatingLabelText: 'Time zone' }))).getControl(MatInputHarness);
    expect(await zone!.getValue()).toBe('Europe/Berlin');
    await choose('Time is', 'elapsed time');
    expect(await shown('Unit')).toBe('s');
  });
});

describe('Logger import, a CO2 column that is already dry', () => {
  afterEach(() => localStorage.clear());
  it('when the crew ticks "already dry", then the mapping kept for the analyzer says so', async () => {
    const { text, choose, pick, loader } = await render();
    await pick(FILE);
    await choose('Format', 'DD.MM.YYYY HH:mm:ss');
    await (await loader.getHarness(MatCheckboxHarness.with({ selector: '[data-testid="co2-dry"]' }))).check();
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Read the file' }))).click();
    await until(() => text('[data-testid="read-summary"]'), 'the review step');
    const preset = JSON.parse(localStorage.getItem(`fw.logger-preset.${ANALYZER}`) ?? 'null') as LoggerMapping | null;
    expect(preset?.co2.dry).toBe(true);
  });
});

describe('Logger import, temperature columns', () => {
  afterEach(() => localStorage.clear());

  it('when the file has the analyzer’s cell temperature and an unclear one, then neither is taken as chamber air: both are listed with their ranges and the crew chooses', async () => {
    const { text, shown, choose, pick } = await render();
    await pick(
      'timestamp,co2_ppm,Cell_Temp,Temp\n2025-06-12 07:00:00,420.1,51.2,18.0\n2025-06-12 07:00:01,420.6,51.0,18.2\n2025-06-12 07:00:02,421.0,50.9,18.3\n',
    );
    expect(await shown('Chamber air temperature column')).toBe('not in this file');
    const list = text('[data-testid="temp-columns"]');
    expect(list).toContain(
      'Cell_Temp: 50.9 to 51.2 — looks like the analyzer’s own (cell or electronics) temperature, not the chamber air',
    );
    expect(list).toContain('Temp: 18 to 18.3 — not clear which temperature this is');
    expect(list).toContain("the flux will use the visit's air temperature");
    await choose('Chamber air temperature column', 'Temp');
    await until(() => !text('[data-testid="temp-columns"]').includes('No chamber air temperature chosen'), 'the choice');
    expect(await shown('Chamber air temperature column')).toBe('Temp');
  });
});

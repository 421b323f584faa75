import { performance } from 'node:perf_hooks';
import { MAX_CELL_CHARS, MAX_COLUMNS, MAX_CSV_ROWS, MAX_HEADER_CHARS, parseCsv, resolveMapping } from './collar-csv';

describe('collar CSV headers and bounds', () => {
  it('when a header is 50 000 "(" or "[" characters, then guessing the mapping is linear', () => {
    for (const bracket of ['(', '[', '(a', '[)']) {
      const header = bracket.repeat(50_000 / bracket.length);
      const s = performance.now();
      resolveMapping(['code', 'plot', header], {});
      expect([bracket, performance.now() - s < 250]).toEqual([bracket, true]);
    }
  });

  it('when headers carry units in brackets or suffixes, then they are still recognised', () => {
    const mapping = resolveMapping(
      ['Collar code', 'Plot', 'Diameter (cm)', 'Height [cm]', 'insertion_cm', 'Lat (°)', 'lon', 'Notes (free text'],
      {},
    );
    expect(mapping).toEqual({
      code: 'Collar code',
      plot: 'Plot',
      diameterCm: 'Diameter (cm)',
      heightCm: 'Height [cm]',
      insertionCm: 'insertion_cm',
      latitude: 'Lat (°)',
      longitude: 'lon',
    });
  });

  it('when the header, the column count or a cell is beyond its bound, then the file is refused with 400 naming the bound', () => {
    const refused = (csv: string) => {
      try {
        parseCsv(csv);
      } catch (err) {
        return [(err as { status: number }).status, (err as Error).message];
      }
      return null;
    };
    expect(refused(`code,plot,${'h'.repeat(MAX_HEADER_CHARS)}\nC1,P1,x\n`)).toBeNull();
    expect(refused(`code,plot,${'h'.repeat(MAX_HEADER_CHARS + 1)}\nC1,P1,x\n`)).toEqual([
      400,
      expect.stringMatching(/Column header 3 \("h{40}…"\) is longer than 200 characters/),
    ]);
    const cols = (n: number) => Array.from({ length: n }, (_, i) => `c${i}`).join(',');
    expect(refused(`${cols(MAX_COLUMNS)}\n`)).toBeNull();
    expect(refused(`${cols(MAX_COLUMNS + 1)}\n`)).toEqual([
      400,
      `The file has more than ${MAX_COLUMNS} columns (${MAX_COLUMNS + 1}); keep the collar columns and remove the rest`,
    ]);
    expect(refused(`code,plot,notes\nC1,P1,${'n'.repeat(MAX_CELL_CHARS)}\n`)).toBeNull();
    expect(refused(`code,plot,notes\nC1,P1,ok\nC2,P1,${'n'.repeat(MAX_CELL_CHARS + 1)}\n`)).toEqual([
      400,
      `Row 3, column "notes": the cell is longer than ${MAX_CELL_CHARS} characters`,
    ]);
  });

  it('when a file has 5000 collar rows and blank lines, then it is read; 5001 rows are refused naming the bound', () => {
    const rows = (n: number) => Array.from({ length: n }, (_, i) => `C${i},P1\n\n  \n`).join('');
    expect(parseCsv(`code,plot\n${rows(MAX_CSV_ROWS)}`).table.rows).toHaveLength(MAX_CSV_ROWS);
    expect(() => parseCsv(`code,plot\n${rows(MAX_CSV_ROWS + 1)}`)).toThrow(
      `The file has more than ${MAX_CSV_ROWS} collar rows; split it into files of at most ${MAX_CSV_ROWS}`,
    );
  });

  it('when cells are quoted with delimiters, quotes and line breaks inside, or the file uses semicolons, then they read as written', () => {
    const { table, errors } = parseCsv('code;plot;notes\r\n"C1";P1;"say ""hi""; then\nleave"\r\nC2;P2;\r\n');
    expect(errors).toEqual([]);
    expect(table.rows.map((r) => r.cells)).toEqual([
      { code: 'C1', plot: 'P1', notes: 'say "hi"; then\nleave' },
      { code: 'C2', plot: 'P2', notes: '' },
    ]);
  });
});

import Papa from 'papaparse';
import { csvField, csvLine, neutralizeFormula } from './csv-cell';

// The trigger characters and the apostrophe are OWASP's "CSV Injection" guidance (common practice).
describe('CSV cells', () => {
  it.each([
    '=HYPERLINK("http://x.example","y")',
    "+cmd|' /C calc'!A0",
    "-2+3+cmd|' /C calc'!A0",
    '@SUM(1+1)',
    '\t=1+2',
    '\r=1+2',
    '-',
    '+',
    '=',
    '-x',
  ])('when text starts a formula (%j), then it is written as text behind an apostrophe', (text) => {
    expect(neutralizeFormula(text)).toBe(`'${text}`);
    expect(Papa.parse<string[]>(csvLine([text, 'next'])).data[0]).toEqual([`'${text}`, 'next']);
  });

  it.each(['-0.31', '+5', '-12', '-1e-3', '-.5', '12.50'])('when text is a plain number (%j), then it stays a number', (text) => {
    expect(neutralizeFormula(text)).toBe(text);
    expect(csvField(text)).toBe(text);
  });

  it('when a value is a number, boolean or missing, then it is written as such, never with an apostrophe', () => {
    expect(csvLine([-0.31, -12, true, false, null, undefined, Number.NaN, -Infinity])).toBe('-0.31,-12,true,false,,,,\n');
  });

  it('when ordinary text holds a comma, quote or line break, then the field is quoted and reads back exactly', () => {
    const text = ['A1, north', 'the "wet" one', 'line\nbreak', 'P-01', 'a=b'];
    const line = csvLine(text, '\r\n');
    expect(line.endsWith('\r\n')).toBe(true);
    expect(Papa.parse<string[]>(line.trimEnd()).data[0]).toEqual(text);
  });

  it('when a formula hides behind a quote-needing character, then it is still neutralised inside the quotes', () => {
    expect(csvField('=1+2,"x"')).toBe('"\'=1+2,""x"""');
  });
});

import { provideHttpClient } from '@angular/common/http';
import { TestBed } from '@angular/core/testing';
import { BoardApi } from './board-api';

describe('BoardApi.csvUrl', () => {
  it('when the CSV is for a spreadsheet, then the URL asks for the byte order mark; the round is kept either way', () => {
    TestBed.configureTestingModule({ providers: [provideHttpClient()] });
    const api = TestBed.inject(BoardApi);
    expect(api.csvUrl('c1', null)).toBe('/api/campaigns/c1/progress.csv');
    expect(api.csvUrl('c1', 2)).toBe('/api/campaigns/c1/progress.csv?round=2');
    expect(api.csvUrl('c1', null, true)).toBe('/api/campaigns/c1/progress.csv?bom=1');
    expect(api.csvUrl('c1', 2, true)).toBe('/api/campaigns/c1/progress.csv?round=2&bom=1');
  });
});

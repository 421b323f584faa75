import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { RecordsApi } from './records-api';

describe('RecordsApi', () => {
  let api: RecordsApi;
  let backend: HttpTestingController;

  beforeEach(() => {
    TestBed.configureTestingModule({ providers: [provideHttpClient(), provideHttpClientTesting()] });
    api = TestBed.inject(RecordsApi);
    backend = TestBed.inject(HttpTestingController);
  });
  afterEach(() => backend.verify());

  const settle = () => new Promise((resolve) => setTimeout(resolve, 0));
  const collar = (n: number) => ({ id: `c${n}`, rev: 1, code: `C${n}`, areaCm2: 314 });

  it('when a site holds more records than one page, then every page is read until the total is reached', async () => {
    const all = api.list('collar', { siteId: 's1' });
    const first = backend.expectOne((r) => r.url === '/api/collars' && r.params.get('offset') === '0');
    expect(first.request.params.get('siteId')).toBe('s1');
    expect(first.request.params.get('limit')).toBe('1000');
    first.flush({ items: Array.from({ length: 1000 }, (_, i) => collar(i)), total: 1001 });
    await settle();
    backend.expectOne((r) => r.url === '/api/collars' && r.params.get('offset') === '1000').flush({ items: [collar(1000)], total: 1001 });
    const rows = await all;
    expect(rows).toHaveLength(1001);
    // Typed by entity: a collar's derived area is a field of the type, not a string-index read.
    expect(rows[1000].areaCm2).toBe(314);
  });

  it('when the server answers an empty page before the total, then the list ends instead of asking forever', async () => {
    const all = api.list('offsetSet');
    backend.expectOne((r) => r.url === '/api/offset-sets').flush({ items: [], total: 5 });
    expect(await all).toEqual([]);
  });
});

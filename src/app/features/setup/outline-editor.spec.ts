import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { TestBed } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { MatSelectHarness } from '@angular/material/select/testing';
import { OutlineEditor } from './outline-editor';
import { parseOutline, toOutline, toVertices } from './outline-geometry';

const SITE = '0b5e7d2c-1111-4a4a-8a8a-000000000001';
const P1 = { id: '00000000-0000-4000-8000-000000000001', rev: 3, siteId: SITE, code: 'P1', outline: null };
const P2 = {
  id: '00000000-0000-4000-8000-000000000002',
  rev: 5,
  siteId: SITE,
  code: 'P2',
  outline: {
    type: 'Polygon',
    coordinates: [
      [
        [11.5, 50.9],
        [11.5002, 50.9],
        [11.5002, 50.9002],
        [11.5, 50.9],
      ],
    ],
  },
};
const SQUARE = {
  type: 'Polygon',
  coordinates: [
    [
      [11.6, 50.97],
      [11.6004, 50.97],
      [11.6004, 50.9703],
      [11.6, 50.9703],
      [11.6, 50.97],
    ],
  ],
};

async function editor() {
  TestBed.configureTestingModule({ imports: [OutlineEditor], providers: [provideHttpClient(), provideHttpClientTesting()] });
  const fixture = TestBed.createComponent(OutlineEditor);
  fixture.componentRef.setInput('siteId', SITE);
  fixture.componentRef.setInput('site', { id: SITE, rev: 1, name: 'Birch Terrace', latitude: 50.97, longitude: 11.6, tileUrl: null });
  fixture.componentRef.setInput('plots', [P1, P2]);
  fixture.detectChanges();
  const backend = TestBed.inject(HttpTestingController);
  backend.expectOne((r) => r.url === '/api/collars').flush({ items: [], total: 0, limit: 1000, offset: 0 });
  await fixture.whenStable();
  const loader = TestbedHarnessEnvironment.loader(fixture);
  const text = await loader.getHarness(MatInputHarness.with({ selector: 'textarea' }));
  const button = (name: string) => loader.getHarness(MatButtonHarness.with({ text: name }));
  const status = () => (fixture.nativeElement as HTMLElement).querySelector('[data-testid=outline-status]')!.textContent!.trim();
  const problems = () =>
    [...(fixture.nativeElement as HTMLElement).querySelectorAll('[data-testid=outline-errors] li')].map((li) => li.textContent!.trim());
  const choose = async (code: string) => (await loader.getHarness(MatSelectHarness)).clickOptions({ text: new RegExp(`^${code}`) });
  return { fixture, backend, text, button, status, problems, choose };
}

describe('OutlineEditor', () => {
  it('when a GeoJSON square is typed for P1 and saved, then the plot is patched with that Polygon at its current rev', async () => {
    const { fixture, backend, text, button, status, choose } = await editor();
    await choose('P1');
    await text.setValue(JSON.stringify(SQUARE));
    await (await button('Use this GeoJSON')).click();
    expect(status()).toBe('GeoJSON outline with 4 corners shown on the map; save to keep it');
    await (await button('Save outline')).click();
    const req = backend.expectOne((r) => r.method === 'PATCH' && r.url === `/api/plots/${P1.id}`);
    expect(req.request.body).toEqual({ rev: 3, outline: SQUARE });
    req.flush({ record: { ...P1, rev: 4, outline: SQUARE } });
    await new Promise((r) => setTimeout(r, 0));
    await fixture.whenStable();
    expect(status()).toBe('Outline of P1 saved');
  });

  it('when a plot that has an outline is chosen, then its GeoJSON is shown to edit', async () => {
    const { text, choose } = await editor();
    await choose('P2');
    expect(JSON.parse(await text.getValue())).toEqual(P2.outline);
  });

  // Ring rules: RFC 7946 §3.1.6 (Butler et al. 2016, IETF), a linear ring has ≥ 4 positions and ends where it starts.
  it('when the GeoJSON is a line or an open ring, then the problems are listed and nothing is sent', async () => {
    const { backend, text, button, problems, choose } = await editor();
    await choose('P1');
    await text.setValue('{"type":"LineString","coordinates":[[11.6,50.97],[11.7,50.98]]}');
    await (await button('Use this GeoJSON')).click();
    expect(problems()).toEqual(['The outline must be a GeoJSON Polygon, not a LineString']);
    await text.setValue('{"type":"Polygon","coordinates":[[[11.6,50.97],[11.6004,50.97],[11.6004,50.9703]]]}');
    await (await button('Use this GeoJSON')).click();
    expect(problems()).toEqual([
      'The outer ring needs at least 4 positions (3 corners and the first again)',
      'The outer ring must end where it starts',
    ]);
    await text.setValue('{"type":"Polygon",');
    await (await button('Use this GeoJSON')).click();
    expect(problems()).toEqual(['This is not JSON: check brackets, commas and quotes']);
    await text.setValue('{"type":"Polygon","coordinates":[[["11.6","50.97"]]]}');
    await (await button('Use this GeoJSON')).click();
    expect(problems()[0]).toMatch(/^coordinates\.0\.0\.0: .*number/); // the plot schema's own words
    expect(await (await button('Save outline')).isDisabled()).toBe(false); // P1 has no corners: saving would only keep it empty
    backend.expectNone((r) => r.method === 'PATCH');
  });

  it('when the outline is cleared and saved, then the plot outline becomes null', async () => {
    const { backend, button, choose } = await editor();
    await choose('P2');
    await (await button('Clear')).click();
    await (await button('Save outline')).click();
    expect(backend.expectOne((r) => r.method === 'PATCH').request.body).toEqual({ rev: 5, outline: null });
  });
});

describe('outline geometry', () => {
  it('when corners are drawn, then the GeoJSON ring repeats the first position and stores [longitude, latitude]', () => {
    const outline = toOutline([
      { lat: 50.97, lng: 11.6 },
      { lat: 50.97, lng: 11.6004 },
      { lat: 50.9703, lng: 11.6004 },
    ]);
    expect(outline).toEqual({
      type: 'Polygon',
      coordinates: [
        [
          [11.6, 50.97],
          [11.6004, 50.97],
          [11.6004, 50.9703],
          [11.6, 50.97],
        ],
      ],
    });
    expect(toVertices(outline)).toEqual([
      { lat: 50.97, lng: 11.6 },
      { lat: 50.97, lng: 11.6004 },
      { lat: 50.9703, lng: 11.6004 },
    ]);
    expect(
      toOutline([
        { lat: 1, lng: 2 },
        { lat: 3, lng: 4 },
      ]),
    ).toBeNull();
  });

  it('when a Feature holds the polygon, then its geometry is used; latitude and longitude swapped past 90° is refused', () => {
    expect(parseOutline(JSON.stringify({ type: 'Feature', properties: {}, geometry: SQUARE })).outline).toEqual(SQUARE);
    const swapped = {
      type: 'Polygon',
      coordinates: [
        [
          [50, 120],
          [50.1, 120],
          [50.1, 120.1],
          [50, 120],
        ],
      ],
    };
    expect(parseOutline(JSON.stringify(swapped)).errors).toEqual([
      'The outer ring has a position outside longitude −180…180 / latitude −90…90 (positions are [longitude, latitude])',
    ]);
  });
});

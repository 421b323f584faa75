import { TestBed } from '@angular/core/testing';
import { OutlineMap } from './outline-map';

const HOSTILE = '<img src=x onerror=alert(1)>';

describe('OutlineMap', () => {
  it('when a collar or plot code holds HTML, then the map labels show it as literal text and no element is made from it', async () => {
    const fixture = TestBed.createComponent(OutlineMap);
    fixture.componentRef.setInput('collars', [{ code: HOSTILE, lat: 50.97, lng: 11.6 }]);
    fixture.componentRef.setInput('others', [
      {
        code: `P${HOSTILE}`,
        vertices: [
          { lat: 50.97, lng: 11.6 },
          { lat: 50.97, lng: 11.601 },
          { lat: 50.971, lng: 11.601 },
        ],
      },
    ]);
    fixture.componentRef.setInput('tileUrl', 'http://tiles.invalid/{z}/{x}/{y}.png');
    fixture.componentRef.setInput('tileAttribution', `© ${HOSTILE}`);
    fixture.detectChanges();
    await fixture.whenStable();
    const host = fixture.nativeElement as HTMLElement;
    const labels = [...host.querySelectorAll('.fw-collar-label')].map((l) => l.textContent);
    expect(labels).toEqual(expect.arrayContaining([HOSTILE, `P${HOSTILE}`]));
    expect(host.querySelector('.leaflet-control-attribution')?.textContent).toContain(`© ${HOSTILE}`);
    expect(host.querySelectorAll('img[onerror], [onerror]')).toHaveLength(0);
    fixture.destroy();
  });
});

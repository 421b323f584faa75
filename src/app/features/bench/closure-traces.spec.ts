import { TestBed } from '@angular/core/testing';
import { ClosureTraces, tracesOf } from './closure-traces';

describe('traces under the CO2 chart', () => {
  it('takes H2O, chamber air temperature and pressure with their units, only those with a value', () => {
    const t = tracesOf({
      tS: [0, 1, 2],
      co2Ppm: [420, 421, 422],
      h2oMmolMol: [null, 12.5, 12.6],
      tempC: [null, null, null],
      pressureKpa: [98.1, 98.1, 98.2],
    });
    expect(t.map((x) => [x.key, x.label, x.unit])).toEqual([
      ['h2o', 'H2O', 'mmol/mol'],
      ['pressure', 'Chamber pressure', 'kPa'],
    ]);
    expect(t[0].values).toEqual([null, 12.5, 12.6]);
    expect(tracesOf({ tS: [0], co2Ppm: [1], h2oMmolMol: null, tempC: [21.5] }).map((x) => [x.label, x.unit])).toEqual([
      ['Chamber air temperature', '°C'],
    ]);
  });

  it('says so when the closure has none of them', () => {
    TestBed.configureTestingModule({ imports: [ClosureTraces] });
    const fixture = TestBed.createComponent(ClosureTraces);
    fixture.componentRef.setInput('series', { tS: [0, 1], co2Ppm: [420, 421], h2oMmolMol: null, tempC: null, pressureKpa: null });
    fixture.detectChanges();
    expect((fixture.nativeElement as HTMLElement).querySelector('[data-testid="no-traces"]')!.textContent).toBe(
      "This closure's file has no H2O, temperature or pressure column.",
    );
  });
});

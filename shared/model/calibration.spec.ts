import { calibrationDrifts, calibrationPassed, worstDriftPct } from './calibration';
import { analyzerCheckFields, siteFields } from './site-layout';

const SITE = '0f3c2a9e-5b1d-4c7e-9a2f-6d8e1b4c7a10';
const ANALYZER = '6b1e9d0c-3a2f-4e5d-8c7b-1a2b3c4d5e6f';
const calibration = (fields: Record<string, unknown> = {}) => ({
  siteId: SITE,
  analyzerId: ANALYZER,
  kind: 'calibration',
  at: '2026-06-01T07:30:00Z',
  passed: true,
  zeroGasPpm: 0,
  zeroCylinder: 'N2-0412',
  zeroBeforePpm: 2.4,
  zeroAfterPpm: 0.1,
  spanGasPpm: 1000,
  spanCylinder: 'CYL 88317',
  spanBeforePpm: 1012.3,
  spanAfterPpm: 1000.4,
  ...fields,
});

// Drift as the as-found error (reading before adjustment − certified concentration) is common practice.
describe('calibration records', () => {
  it('when zero and span readings are given, then the schema stores each drift as reading before − gas', () => {
    const r = analyzerCheckFields.parse(calibration());
    expect([r.zeroDriftPpm, r.driftPpm]).toEqual([2.4, 12.3]);
  });

  it('when a drift is sent that the readings contradict, then the drift from the readings is stored', () => {
    expect(analyzerCheckFields.parse(calibration({ driftPpm: 99, zeroDriftPpm: -7 }))).toMatchObject({ driftPpm: 12.3, zeroDriftPpm: 2.4 });
  });

  it('when an older calibration carries only its span gas and drift, then that drift is kept', () => {
    const r = analyzerCheckFields.parse(
      calibration({ zeroGasPpm: null, zeroBeforePpm: null, zeroAfterPpm: null, spanBeforePpm: null, spanAfterPpm: null, driftPpm: -4.6 }),
    );
    expect([r.driftPpm, r.zeroDriftPpm]).toEqual([-4.6, null]);
  });

  it('when the span gas is 0, negative or not above the zero gas, then it is refused with a message on spanGasPpm', () => {
    for (const [span, msg] of [
      [0, /above 0/],
      [-5, /at least 0/],
      [400, /above the zero gas/],
    ] as const) {
      const r = analyzerCheckFields.safeParse(calibration({ spanGasPpm: span, zeroGasPpm: span === 400 ? 400 : 0 }));
      expect(r.success).toBe(false);
      expect(r.error!.issues.find((i) => i.path[0] === 'spanGasPpm')?.message).toMatch(msg);
    }
  });

  it('when readings are given without the gas they were taken on, then the gas is asked for', () => {
    const r = analyzerCheckFields.safeParse(calibration({ zeroGasPpm: null }));
    expect(r.error!.issues.map((i) => [i.path.join('.'), i.message])).toEqual([
      ['zeroGasPpm', 'Give the zero gas concentration its readings were taken on'],
    ]);
  });

  it('when a cylinder id is text, then it is kept trimmed; a number or 101 characters are refused', () => {
    expect(analyzerCheckFields.parse(calibration({ spanCylinder: '  CYL 88317 ' })).spanCylinder).toBe('CYL 88317');
    expect(analyzerCheckFields.safeParse(calibration({ spanCylinder: 88317 })).success).toBe(false);
    expect(analyzerCheckFields.safeParse(calibration({ zeroCylinder: 'x'.repeat(101) })).error!.issues[0].message).toBe(
      'Zero gas cylinder: at most 100 characters',
    );
  });

  it('when a reading lies outside the analyzer range of values, then it is refused with its unit', () => {
    expect(analyzerCheckFields.safeParse(calibration({ spanAfterPpm: 25000 })).error!.issues[0].message).toBe(
      'Span reading after must be at most 20000 µmol/mol',
    );
  });

  it('when a calibration is skipped, then a reason is enough and no gas is needed', () => {
    expect(
      analyzerCheckFields.safeParse({
        siteId: SITE,
        analyzerId: ANALYZER,
        kind: 'calibration',
        at: '2026-06-01T07:30:00Z',
        skipped: true,
        skipReason: 'Span cylinder empty',
      }).success,
    ).toBe(true);
    expect(
      analyzerCheckFields.safeParse({ siteId: SITE, kind: 'leak', at: '2026-06-01T07:30:00Z', skipped: true }).error!.issues[0].message,
    ).toBe('A skipped check needs a reason');
  });

  it('when a site says nothing of drift, then its limit is 2 % of the span gas (common practice)', () => {
    expect(siteFields.parse({ name: 'S', timezone: 'UTC', elevationM: null }).calibrationDriftLimitPct).toBe(2);
    expect(siteFields.safeParse({ name: 'S', timezone: 'UTC', elevationM: null, calibrationDriftLimitPct: 0 }).success).toBe(false);
  });
});

describe('calibration drift and pass', () => {
  it('when drifts are judged, then the larger of zero and span counts, in % of the span gas', () => {
    expect(calibrationDrifts({ zeroGasPpm: 0, zeroBeforePpm: -3, spanGasPpm: 500, spanBeforePpm: 488 })).toEqual({
      zeroDriftPpm: -3,
      driftPpm: -12,
    });
    expect(worstDriftPct({ zeroDriftPpm: -3, driftPpm: -12, spanGasPpm: 500 })).toBe(2.4); // 12 / 500 × 100
    expect(worstDriftPct({ zeroDriftPpm: 30, driftPpm: 5, spanGasPpm: 1000 })).toBe(3);
    expect(worstDriftPct({ driftPpm: null, spanGasPpm: 1000 })).toBeNull();
  });

  it('when the as-left readings are within the limit of their gas, then the calibration passes; one outside fails it', () => {
    const c = { zeroGasPpm: 0, zeroAfterPpm: 0.5, spanGasPpm: 1000, spanAfterPpm: 1019 };
    expect(calibrationPassed(c, 2)).toBe(true); // tolerance 20 µmol/mol
    expect(calibrationPassed({ ...c, spanAfterPpm: 1021 }, 2)).toBe(false);
    expect(calibrationPassed({ spanGasPpm: 1000 }, 2)).toBeNull();
  });
});

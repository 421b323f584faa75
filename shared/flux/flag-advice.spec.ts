import { fitClosure } from './closure-fit';
import type { ClosureInput } from './closure-input';
import { FLAG_ADVICE, flagAdvice } from './flag-advice';
import { QC_FLAGS } from './qc-flags';
import { syntheticClosure } from './test-closures';

const base = (over: Partial<ClosureInput>): ClosureInput => {
  const c = syntheticClosure({ points: 121, dtS: 1, settleS: 20, c0: 420, slope: 0.5, p3: 0 });
  return { ...c, pressureKpa: 100, tempC: 20, volumeCm3: 4000, areaCm2: 314.16, settleS: 20, ...over };
};

describe('Flag words and advice (one table for the phone and the Bench)', () => {
  it('every flag code has words, advice and an action', () => {
    for (const code of Object.keys(QC_FLAGS)) {
      const a = (FLAG_ADVICE as Record<string, { words: string; advice: string; action: string }>)[code];
      expect(a).toBeDefined();
      expect(a.words.length).toBeGreaterThan(10);
      expect(a.advice.length).toBeGreaterThan(5);
      expect(a.words).not.toContain(code);
    }
    expect(Object.keys(FLAG_ADVICE).sort()).toEqual(Object.keys(QC_FLAGS).sort());
  });

  it('every flag the engine emits on a range of closures is one with words', () => {
    const seen = new Set<string>();
    const short = syntheticClosure({ points: 30, dtS: 1, settleS: 20, c0: 420, slope: -0.5, p3: 0 });
    const curved = syntheticClosure({ points: 151, dtS: 1, settleS: 20, c0: 700, slope: 3, p3: -0.05 });
    const spiky = syntheticClosure({ points: 121, dtS: 1, settleS: 20, c0: 420, slope: 0.5, p3: 0 });
    spiky.co2Ppm[60] += 80;
    const inputs: ClosureInput[] = [
      base({}),
      base({ ...short }),
      base({ ...curved, ambientPpm: 420, footprintAreaCm2: 330 }),
      base({ ...spiky }),
      base({ co2Ppm: base({}).co2Ppm.map(() => 420), pressureIsDefault: true, offsetAfter: true, tempSource: 'visit' }),
      base({ tempSource: 'site-default' }),
      base({ tS: [0, 1] }),
    ];
    for (const i of inputs) for (const f of fitClosure(i).flags) seen.add(f);
    expect(seen.size).toBeGreaterThan(8);
    for (const f of seen) expect(flagAdvice(f).words).not.toBe(f);
  });

  it('an unknown code reads as itself with a pointer to the lab', () => {
    expect(flagAdvice('from-the-future')).toMatchObject({ words: 'from-the-future', action: 'none' });
  });
});

import { demoId, hashString, Rng } from './prng';

describe('seeded generator', () => {
  it('when two generators share a seed, then they give the same sequence; another seed gives another', () => {
    const a = new Rng(42);
    const b = new Rng(42);
    const c = new Rng(43);
    const seqA = Array.from({ length: 5 }, () => a.next());
    expect(Array.from({ length: 5 }, () => b.next())).toEqual(seqA);
    expect(Array.from({ length: 5 }, () => c.next())).not.toEqual(seqA);
  });

  it('when 20 000 uniforms are drawn, then they lie in [0, 1) with mean ≈ 1/2 and variance ≈ 1/12', () => {
    const r = new Rng(7);
    const xs = Array.from({ length: 20000 }, () => r.next());
    const mean = xs.reduce((s, x) => s + x, 0) / xs.length;
    const variance = xs.reduce((s, x) => s + (x - mean) ** 2, 0) / xs.length;
    expect(Math.min(...xs)).toBeGreaterThanOrEqual(0);
    expect(Math.max(...xs)).toBeLessThan(1);
    expect(mean).toBeCloseTo(0.5, 2);
    expect(variance).toBeCloseTo(1 / 12, 2);
  });

  it('when 20 000 normals are drawn, then mean and SD match the request and about 95 % fall within ±1.96 σ', () => {
    const r = new Rng(9);
    const xs = Array.from({ length: 20000 }, () => r.normal(10, 2));
    const mean = xs.reduce((s, x) => s + x, 0) / xs.length;
    const sd = Math.sqrt(xs.reduce((s, x) => s + (x - mean) ** 2, 0) / (xs.length - 1));
    expect(mean).toBeCloseTo(10, 1);
    expect(sd).toBeCloseTo(2, 1);
    const inside = xs.filter((x) => Math.abs(x - 10) < 1.96 * 2).length / xs.length;
    expect(inside).toBeGreaterThan(0.94);
    expect(inside).toBeLessThan(0.96);
  });

  it('when a list is shuffled, then it keeps every item once', () => {
    const out = new Rng(3).shuffle([1, 2, 3, 4, 5, 6]);
    expect([...out].sort()).toEqual([1, 2, 3, 4, 5, 6]);
    expect(out).not.toEqual([1, 2, 3, 4, 5, 6]);
  });

  it('when ints are drawn from [1, 3], then all three values and nothing else appear', () => {
    const r = new Rng(5);
    expect([...new Set(Array.from({ length: 300 }, () => r.int(1, 3)))].sort()).toEqual([1, 2, 3]);
  });
});

describe('demo ids', () => {
  it('when the same name is asked twice, then the same version-5 UUID comes back; another name gives another', () => {
    expect(demoId('collar:B1-P01-C1')).toBe(demoId('collar:B1-P01-C1'));
    expect(demoId('collar:B1-P01-C1')).toMatch(/^[0-9a-f]{8}-[0-9a-f]{4}-5[0-9a-f]{3}-[89ab][0-9a-f]{3}-[0-9a-f]{12}$/);
    expect(demoId('collar:B1-P01-C2')).not.toBe(demoId('collar:B1-P01-C1'));
  });

  it('when FNV-1a hashes the empty string and "a", then it gives the published offset basis and test vector', () => {
    // FNV-1a 32-bit: offset basis 0x811c9dc5; "a" → 0xe40c292c (Fowler, Noll, Vo; IETF draft-eastlake-fnv test vectors; from memory).
    expect(hashString('')).toBe(0x811c9dc5);
    expect(hashString('a')).toBe(0xe40c292c);
  });
});

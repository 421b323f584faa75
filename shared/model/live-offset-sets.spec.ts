import { liveOffsetSets } from './live-offset-sets';

describe('liveOffsetSets', () => {
  const set = (id: string, supersedesId: string | null = null, deleted = false) => ({ id, supersedesId, deleted });

  it('when a set is corrected, then only the correction counts', () => {
    expect(liveOffsetSets([set('a'), set('b', 'a'), set('c')]).map((s) => s.id)).toEqual(['b', 'c']);
  });

  it('when the correction is deleted, then the set it replaced counts again', () => {
    expect(liveOffsetSets([set('a'), set('b', 'a', true)]).map((s) => s.id)).toEqual(['a']);
  });

  it('when a chain of corrections is kept, then only its last link counts', () => {
    expect(liveOffsetSets([set('a'), set('b', 'a'), set('c', 'b')]).map((s) => s.id)).toEqual(['c']);
  });
});

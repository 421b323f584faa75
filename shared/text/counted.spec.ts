import { counted } from './counted';

describe('counted', () => {
  it('when the count is one, then the noun is singular; otherwise plural (also for zero)', () => {
    expect(counted(1, 'closure')).toBe('1 closure');
    expect(counted(0, 'closure')).toBe('0 closures');
    expect(counted(2, 'closure')).toBe('2 closures');
    expect(counted(1, 'tap lined up', 'taps lined up')).toBe('1 tap lined up');
    expect(counted(3, 'tap lined up', 'taps lined up')).toBe('3 taps lined up');
  });
});

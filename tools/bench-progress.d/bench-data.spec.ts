import { expectedTotals, plannedState } from './bench-data';

describe('benchmark progress states', () => {
  it('when 5 000 collars are planted, then half are complete, a fifth partial, a quarter due and 5 % skipped', () => {
    expect(expectedTotals(5000)).toEqual({ complete: 2500, partial: 1000, due: 1250, skipped: 250 });
  });

  it('when collars are taken in order, then the state follows the collar index modulo 20 as documented', () => {
    expect([0, 9, 10, 12, 13, 14, 15, 19, 20].map(plannedState)).toEqual([
      'complete',
      'complete',
      'partial',
      'partial',
      'partial',
      'skipped',
      'due',
      'due',
      'complete',
    ]);
  });
});

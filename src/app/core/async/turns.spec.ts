import { Turns } from './turns';

const later = (ms: number) => new Promise<void>((r) => setTimeout(r, ms));

describe('Turns', () => {
  it('when two calls share a key, then the second starts after the first settles, even when the first fails', async () => {
    const turns = new Turns();
    const log: string[] = [];
    const a = turns.run('k', async () => {
      log.push('a start');
      await later(20);
      log.push('a end');
      throw new Error('a failed');
    });
    const b = turns.run('k', async () => {
      log.push('b start');
      return 'b';
    });
    await expect(a).rejects.toThrow('a failed');
    await expect(b).resolves.toBe('b');
    expect(log).toEqual(['a start', 'a end', 'b start']);
  });

  it('when two calls have different keys, then they overlap', async () => {
    const turns = new Turns();
    const log: string[] = [];
    await Promise.all([
      turns.run('x', async () => {
        log.push('x start');
        await later(20);
        log.push('x end');
      }),
      turns.run('y', async () => {
        log.push('y start');
      }),
    ]);
    expect(log).toEqual(['x start', 'y start', 'x end']);
  });
});

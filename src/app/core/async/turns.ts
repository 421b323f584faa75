/**
 * Runs work under a key one call after another: a call starts once the previous call under the
 * same key has settled (whether it failed or not); calls under other keys run freely. A write that
 * reads what the device holds first ("is there a visit yet?") needs this, since two taps or a
 * keypress and an autosave can otherwise both read "none" and both create.
 */
export class Turns {
  private readonly tails = new Map<string, Promise<unknown>>();

  run<T>(key: string, work: () => Promise<T>): Promise<T> {
    const before = this.tails.get(key) ?? Promise.resolve();
    const mine = before.catch(() => undefined).then(work);
    this.tails.set(key, mine);
    const forget = () => {
      if (this.tails.get(key) === mine) this.tails.delete(key);
    };
    mine.then(forget, forget);
    return mine;
  }
}

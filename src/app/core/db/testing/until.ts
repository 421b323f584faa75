import { TestBed } from '@angular/core/testing';

/**
 * Waits in a component test until `probe` gives a value: Dexie's liveQuery answers arrive
 * asynchronously, so the spec ticks change detection and polls (2 s at most) instead of sleeping.
 */
export async function until<T>(
  probe: () => T | undefined | null | false | Promise<T | undefined | null | false>,
  what: string,
): Promise<T> {
  for (let i = 0; i < 400; i++) {
    TestBed.tick();
    const v = await probe();
    if (v) return v;
    await new Promise((r) => setTimeout(r, 5));
  }
  throw new Error(`timed out waiting for ${what}`);
}

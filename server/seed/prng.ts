import { v5 as uuidv5 } from 'uuid';

/**
 * A small seeded generator (mulberry32) so the invented demo scenario comes out the same on
 * every run: the lab screens, the screenshots and the tests all see the same numbers.
 */
export class Rng {
  private state: number;
  private spare: number | null = null;

  constructor(seed: number) {
    this.state = seed >>> 0;
  }

  /** Uniform in [0, 1). */
  next(): number {
    // mulberry32: 32-bit state, passes the usual statistical batteries for this kind of use.
    this.state = (this.state + 0x6d2b79f5) >>> 0;
    let t = this.state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  }

  uniform(min: number, max: number): number {
    return min + (max - min) * this.next();
  }

  /** Integer in [min, max], both ends included. */
  int(min: number, max: number): number {
    return min + Math.floor(this.next() * (max - min + 1));
  }

  chance(p: number): boolean {
    return this.next() < p;
  }

  /** Normal deviate (Box–Muller; the second value of each pair is kept for the next call). */
  normal(mean = 0, sd = 1): number {
    if (this.spare !== null) {
      const z = this.spare;
      this.spare = null;
      return mean + sd * z;
    }
    let u = 0;
    while (u === 0) u = this.next();
    const v = this.next();
    const r = Math.sqrt(-2 * Math.log(u));
    this.spare = r * Math.sin(2 * Math.PI * v);
    return mean + sd * r * Math.cos(2 * Math.PI * v);
  }

  pick<T>(items: readonly T[]): T {
    return items[Math.floor(this.next() * items.length)];
  }

  /** A shuffled copy (Fisher–Yates). */
  shuffle<T>(items: readonly T[]): T[] {
    const out = [...items];
    for (let i = out.length - 1; i > 0; i--) {
      const j = Math.floor(this.next() * (i + 1));
      [out[i], out[j]] = [out[j], out[i]];
    }
    return out;
  }

  /** An independent stream for one part of the scenario, so adding draws elsewhere changes nothing here. */
  fork(label: string): Rng {
    return new Rng(hashString(label) ^ this.state);
  }
}

/** FNV-1a, 32 bit: turns a label into a seed. */
export function hashString(s: string): number {
  let h = 0x811c9dc5;
  for (let i = 0; i < s.length; i++) {
    h ^= s.charCodeAt(i);
    h = Math.imul(h, 0x01000193);
  }
  return h >>> 0;
}

/** Namespace of the demo scenario's name-based ids (a random UUID fixed once for this project). */
const DEMO_NAMESPACE = '7c1d9a52-3e84-4f0b-b6a1-2d5e8f3c9b47';

/**
 * A stable UUID for a named demo record ("collar:B1-P03-C2"): the same on every run and on
 * every machine, so tests and bookmarks can refer to demo records by name.
 */
export function demoId(name: string): string {
  return uuidv5(name, DEMO_NAMESPACE);
}

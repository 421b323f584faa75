import { ChangeDetectionStrategy, Component, DestroyRef, computed, effect, inject, input, signal, untracked } from '@angular/core';

/** m:ss for a count of seconds. */
export function clockText(totalS: number): string {
  const s = Math.max(0, Math.floor(totalS));
  return `${Math.floor(s / 60)}:${String(s % 60).padStart(2, '0')}`;
}

/**
 * The end-of-closure signal where the device allows it: a vibration and a short tone. Both are
 * extras (a phone on silent, a browser without WebAudio); the timer's text changes in every case.
 */
export function closureEndSignal(): void {
  try {
    navigator.vibrate?.([200, 100, 200]);
  } catch {
    /* vibration refused: the visible signal stays */
  }
  try {
    const Ctx = (globalThis as { AudioContext?: typeof AudioContext }).AudioContext;
    if (!Ctx) return;
    const ctx = new Ctx();
    const osc = ctx.createOscillator();
    const gain = ctx.createGain();
    osc.frequency.value = 880;
    gain.gain.value = 0.2;
    osc.connect(gain).connect(ctx.destination);
    osc.start();
    osc.stop(ctx.currentTime + 0.35);
    osc.onended = () => void ctx.close();
  } catch {
    /* no audio: the visible signal stays */
  }
}

/**
 * Elapsed time of the running closure against the chamber profile's closure length, large enough
 * to read at arm's length; at the end it says so, vibrates and beeps once.
 */
@Component({
  selector: 'fw-closure-timer',
  template: `
    @if (onAt()) {
      <div class="timer" [class.done]="done()" data-testid="closure-timer">
        <span class="elapsed" role="timer" aria-live="off">{{ elapsedText() }}</span>
        <span class="target"> of {{ targetText() }}</span>
      </div>
      <p class="end" role="alert" data-testid="closure-end">@if (done()) { Closure length reached: chamber off }</p>
    }
  `,
  styles: `
    :host { display: flex; flex-direction: column; align-items: center; min-width: 64px; }
    .timer { display: flex; flex-direction: column; align-items: center; font-variant-numeric: tabular-nums; }
    .elapsed { font-size: 1.75rem; font-weight: 700; line-height: 1; }
    .target { font-size: 0.85rem; }
    .done .elapsed { color: var(--mat-sys-error); }
    .end { margin: 0; font-weight: 700; font-size: 0.85rem; text-align: center; }
    .end:empty { display: none; }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ClosureTimer {
  /** Chamber-on time (ISO) of the running closure, null when none runs. */
  readonly onAt = input<string | null>(null);
  /** The chamber profile's closure length, s. */
  readonly targetS = input(120);

  private readonly now = signal(Date.now());
  protected readonly elapsedS = computed(() => {
    const on = this.onAt();
    return on ? Math.max(0, (this.now() - Date.parse(on)) / 1000) : 0;
  });
  protected readonly done = computed(() => !!this.onAt() && this.elapsedS() >= this.targetS());
  protected readonly elapsedText = computed(() => clockText(this.elapsedS()));
  protected readonly targetText = computed(() => clockText(this.targetS()));
  /** The closure the end signal was given for (once per closure, not again on every tick). */
  private signalled: string | null = null;

  constructor() {
    const tick = setInterval(() => this.now.set(Date.now()), 250);
    inject(DestroyRef).onDestroy(() => clearInterval(tick));
    // Drives the device (vibration, tone) and the clock at the end of a closure: no data is loaded here.
    effect(() => {
      const on = this.onAt();
      const done = this.done();
      untracked(() => {
        if (on) this.now.set(Date.now());
        if (done && on && this.signalled !== on) {
          this.signalled = on;
          closureEndSignal();
        }
      });
    });
  }
}

import { TestBed } from '@angular/core/testing';
import { ClosureTimer, clockText } from './closure-timer';

describe('ClosureTimer', () => {
  const on = '2026-12-03T08:41:00.000Z';
  let vibrate: jest.Mock;

  beforeEach(() => {
    jest.useFakeTimers({ now: new Date(on) });
    vibrate = jest.fn(() => true);
    Object.defineProperty(navigator, 'vibrate', { value: vibrate, configurable: true });
  });
  afterEach(() => {
    jest.useRealTimers();
    delete (navigator as { vibrate?: unknown }).vibrate;
  });

  function render(targetS: number) {
    TestBed.configureTestingModule({ imports: [ClosureTimer] });
    const fixture = TestBed.createComponent(ClosureTimer);
    fixture.componentRef.setInput('onAt', on);
    fixture.componentRef.setInput('targetS', targetS);
    fixture.detectChanges();
    const el = fixture.nativeElement as HTMLElement;
    const text = (sel: string) => el.querySelector(sel)?.textContent?.replace(/\s+/g, ' ').trim() ?? '';
    const advance = (ms: number) => {
      jest.advanceTimersByTime(ms);
      fixture.detectChanges();
    };
    return { fixture, text, advance };
  }

  it('formats seconds as m:ss', () => {
    expect([clockText(0), clockText(9.9), clockText(65), clockText(600)]).toEqual(['0:00', '0:09', '1:05', '10:00']);
  });

  it("when the chamber is on, then the elapsed time counts up against the profile's closure length, with no end signal before it", () => {
    const { text, advance } = render(120);
    expect(text('[data-testid="closure-timer"]')).toBe('0:00 of 2:00');
    advance(45_000);
    expect(text('[data-testid="closure-timer"]')).toBe('0:45 of 2:00');
    advance(74_000);
    expect(text('[data-testid="closure-timer"]')).toBe('1:59 of 2:00');
    expect(text('[data-testid="closure-end"]')).toBe('');
    expect(vibrate).not.toHaveBeenCalled();
  });

  it('when the closure length is reached, then it says so and vibrates once (not again on later ticks)', () => {
    const { fixture, text, advance } = render(90);
    advance(90_000);
    expect(text('[data-testid="closure-end"]')).toBe('Closure length reached: chamber off');
    expect((fixture.nativeElement as HTMLElement).querySelector('.timer')?.classList.contains('done')).toBe(true);
    expect(vibrate).toHaveBeenCalledTimes(1);
    advance(30_000);
    expect(text('[data-testid="closure-timer"]')).toBe('2:00 of 1:30');
    expect(vibrate).toHaveBeenCalledTimes(1);
  });

  it('when no closure runs, then nothing is shown', () => {
    const { fixture, text } = render(120);
    fixture.componentRef.setInput('onAt', null);
    fixture.detectChanges();
    expect(text('[data-testid="closure-timer"]')).toBe('');
  });
});

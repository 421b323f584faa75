import { TestBed } from '@angular/core/testing';
import { PointExclusions, exclusionGroups, exclusionText, type PointsChange } from './point-exclusions';

const tS = Array.from({ length: 30 }, (_, i) => i * 2);

function render(exclusions: { index: number; reason: string }[]) {
  TestBed.configureTestingModule({ imports: [PointExclusions] });
  const fixture = TestBed.createComponent(PointExclusions);
  fixture.componentRef.setInput('tS', tS);
  fixture.componentRef.setInput('exclusions', exclusions);
  const sent: PointsChange[] = [];
  fixture.componentInstance.pointsChange.subscribe((c) => sent.push(c));
  fixture.detectChanges();
  const el = fixture.nativeElement as HTMLElement;
  const type = (testId: string, value: string) => {
    const i = el.querySelector<HTMLInputElement>(`[data-testid="${testId}"]`)!;
    i.value = value;
    i.dispatchEvent(new Event('input'));
    fixture.detectChanges();
  };
  const submit = () => Array.from(el.querySelectorAll('button')).find((b) => b.textContent!.includes('Leave out'))!;
  return { fixture, el, sent, type, submit };
}

describe('points left out of a fit', () => {
  it('groups consecutive samples with one reason into runs, in words for the history', () => {
    const list = [
      { index: 46, reason: 'Spike' },
      { index: 45, reason: 'Spike' },
      { index: 47, reason: 'Spike' },
      { index: 70, reason: 'Analyzer glitch' },
      { index: 48, reason: 'Other' },
    ];
    expect(exclusionGroups(list).map((g) => [g.from, g.to, g.reason])).toEqual([
      [45, 47, 'Spike'],
      [48, 48, 'Other'],
      [70, 70, 'Analyzer glitch'],
    ]);
    expect(exclusionText(list)).toBe('45–47 (Spike), 48 (Other), 70 (Analyzer glitch)');
    expect(exclusionText([])).toBe('none');
  });

  it('when the lab gives a time range and a reason, then it sends the samples in that range not already left out', () => {
    const { fixture, sent, type, submit } = render([{ index: 5, reason: 'Spike' }]);
    expect(submit().disabled).toBe(true);
    type('exclude-from', '12');
    type('exclude-to', '6');
    expect(submit().textContent).toContain('Leave out 3 points');
    submit().click();
    fixture.detectChanges();
    expect(sent).toEqual([{ exclude: [3, 4, 6], reason: 'Spike' }]);
  });

  it('when the reason is "other", then the typed words are required and sent', () => {
    const { fixture, el, sent, type, submit } = render([]);
    fixture.componentInstance.pick(10);
    (fixture.componentInstance as unknown as { form: { patchValue(v: object): void } }).form.patchValue({ reason: 'other' });
    fixture.detectChanges();
    expect(submit().textContent).toContain('Leave out 1 point');
    expect(submit().disabled).toBe(true);
    type('exclude-note', '  Crew leaned on the chamber ');
    expect(el.querySelector('[data-testid="exclude-note"]')).not.toBeNull();
    submit().click();
    expect(sent).toEqual([{ exclude: [10], reason: 'Crew leaned on the chamber' }]);
  });

  it('lists what is left out with times, and "Put back" sends that run', () => {
    const { el, sent } = render([
      { index: 20, reason: 'Spike' },
      { index: 21, reason: 'Spike' },
    ]);
    const item = el.querySelector('[data-testid="excluded-points"] li')!;
    expect(item.querySelector('span')!.textContent!.replace(/\s+/g, ' ').trim()).toBe('Samples 20–21 (t 40–42 s): Spike');
    item.querySelector('button')!.click();
    expect(sent).toEqual([{ restore: [20, 21] }]);
  });
});

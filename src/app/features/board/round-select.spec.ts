import { TestBed } from '@angular/core/testing';
import { RoundSelect } from './round-select';

async function render(value: number | null) {
  TestBed.configureTestingModule({ imports: [RoundSelect] });
  const fixture = TestBed.createComponent(RoundSelect);
  fixture.componentRef.setInput('rounds', 3);
  fixture.componentRef.setInput('value', value);
  const chosen: (number | null)[] = [];
  fixture.componentInstance.chosen.subscribe((v) => chosen.push(v));
  await fixture.whenStable();
  const el = fixture.nativeElement as HTMLElement;
  const shown = () => el.querySelector('.mat-mdc-select-value')!.textContent!.trim();
  const pick = async (text: string) => {
    (el.querySelector('mat-select') as HTMLElement).click();
    await fixture.whenStable();
    (Array.from(document.querySelectorAll('mat-option')).find((o) => o.textContent!.trim() === text) as HTMLElement).click();
    await fixture.whenStable();
  };
  return { fixture, shown, pick, chosen };
}

describe('RoundSelect', () => {
  it('when every round is asked for, then the field says "All rounds" instead of staying blank', async () => {
    const { shown } = await render(null);
    expect(shown()).toBe('All rounds');
  });

  it('when a round is chosen and then all rounds again, then the Board hears the round number and then null', async () => {
    const { fixture, shown, pick, chosen } = await render(null);
    await pick('Round 2');
    fixture.componentRef.setInput('value', 2);
    await fixture.whenStable();
    expect(shown()).toBe('Round 2');
    await pick('All rounds');
    expect(chosen).toEqual([2, null]);
  });
});

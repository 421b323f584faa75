import { TestBed } from '@angular/core/testing';
import { ClosureMove, type MoveTarget } from './closure-move';

const targets: MoveTarget[] = [
  { visitId: 'v3', round: 2, collarId: 'k1', collarCode: 'A1' },
  { visitId: 'v2', round: 1, collarId: 'k2', collarCode: 'B2' },
  { visitId: 'v1', round: 1, collarId: 'k3', collarCode: 'A3' },
];

function render(list: MoveTarget[]) {
  TestBed.configureTestingModule({ imports: [ClosureMove] });
  const fixture = TestBed.createComponent(ClosureMove);
  fixture.componentRef.setInput('targets', list);
  fixture.componentRef.setInput('round', 1);
  const moved: string[] = [];
  fixture.componentInstance.move.subscribe((v) => moved.push(v));
  fixture.detectChanges();
  return { fixture, moved, el: fixture.nativeElement as HTMLElement };
}

describe('moving a closure to another visit', () => {
  it("offers the visits of the closure's round first, by collar code, and sends the one chosen", async () => {
    const { fixture, moved, el } = render(targets);
    const button = el.querySelector('button')!;
    expect(button.disabled).toBe(true);
    (el.querySelector('[data-testid="move-target"]') as HTMLElement).click();
    fixture.detectChanges();
    await fixture.whenStable();
    const options = Array.from(document.querySelectorAll('mat-option'));
    expect(options.map((o) => o.textContent!.trim())).toEqual(['Collar A3, round 1', 'Collar B2, round 1', 'Collar A1, round 2']);
    (options[1] as HTMLElement).click();
    fixture.detectChanges();
    expect(button.disabled).toBe(false);
    button.click();
    expect(moved).toEqual(['v2']);
  });

  it('shows nothing when the campaign has no other visit', () => {
    expect(render([]).el.querySelector('form')).toBeNull();
  });
});

import { ChangeDetectionStrategy, Component } from '@angular/core';
import { ScreenIntro } from '../placeholder/screen-intro';

/** Lab staff's review of synced closures and the derived fluxes. */
@Component({
  selector: 'fw-bench',
  imports: [ScreenIntro],
  template: `
    <fw-screen-intro
      icon="biotech"
      title="Bench"
      summary="Review of the synced survey at the station: closure fits, corrections and the fluxes that follow from them."
      [upcoming]="upcoming"
    />
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Bench {
  protected readonly upcoming = [
    'Each closure with its fit after the settle time, to accept or reject with a reason.',
    'Fluxes aggregated along the design: visit, collar, plot, treatment mean ± SE.',
    'Temperature responses per treatment and seasonal totals with their uncertainty.',
    'Exports of the reviewed data.',
  ] as const;
}

import { ChangeDetectionStrategy, Component } from '@angular/core';
import { ScreenIntro } from '../placeholder/screen-intro';

/** The crew lead's overview of a campaign. */
@Component({
  selector: 'fw-board',
  imports: [ScreenIntro],
  template: `
    <fw-screen-intro
      icon="dashboard"
      title="Board"
      summary="The lead's view of the running campaign: what each collar still needs before the crew leaves the site."
      [upcoming]="upcoming"
    />
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Board {
  protected readonly upcoming = [
    'Every collar of the campaign by state: due, partial, complete or skipped (with the reason).',
    'Which collars still need an offset, a closure or probe readings in this round.',
    'Which device has not synced, and since when.',
    'Conflicts to resolve when two people edited the same collar, route or campaign.',
  ] as const;
}

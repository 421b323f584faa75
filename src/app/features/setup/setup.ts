import { ChangeDetectionStrategy, Component } from '@angular/core';
import { ScreenIntro } from '../placeholder/screen-intro';

/** Sites, collars, equipment and people — for admins and crew leads. */
@Component({
  selector: 'fw-setup',
  imports: [ScreenIntro],
  template: `
    <fw-screen-intro
      icon="settings"
      title="Setup"
      summary="What a campaign is built from: sites, plots and collars, routes, chamber profiles, analyzers and people."
      [upcoming]="upcoming"
    />
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Setup {
  protected readonly upcoming = [
    'Sites with their plots, treatments, blocks and collars.',
    'Routes, campaigns and rounds.',
    'Chamber profiles (valid from a date) and analyzers with their calibration records.',
    'Invitations, roles and the field-safety note of each site.',
  ] as const;
}

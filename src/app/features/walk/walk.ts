import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { AuthStore } from '../../core/auth/auth-store';
import { SiteChoice } from '../../core/auth/site-choice';
import { ScreenIntro } from '../placeholder/screen-intro';

/** The crew's screen for today. Works from the device only, so it opens the same offline. */
@Component({
  selector: 'fw-walk',
  imports: [ScreenIntro],
  template: `
    <fw-screen-intro icon="directions_walk" title="Walk" [summary]="summary()" [upcoming]="upcoming" />
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Walk {
  private readonly auth = inject(AuthStore);
  private readonly site = inject(SiteChoice).current;

  protected readonly summary = computed(() => {
    const name = this.auth.user()?.displayName ?? '';
    const where = this.site()?.name;
    return `${name}, this is your walk for today${where ? ` at ${where}` : ''}: the route's collars in order and what is due at each.`;
  });

  protected readonly upcoming = [
    'The route of the current round, collar by collar, with what is due: offset, closure(s), probes.',
    'Recording an offset set, probe readings and visit conditions at a collar.',
    'Closures from the analyzer, with a redo on the spot when a closure is bad.',
    'Everything saved on this device first, with "n not yet synced" until it reaches the server.',
  ] as const;
}

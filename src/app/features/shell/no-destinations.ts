import { ChangeDetectionStrategy, Component } from '@angular/core';

/** A signed-in account without any role that opens a screen. */
@Component({
  selector: 'fw-no-destinations',
  template: `
    <h1>No screens for this account yet</h1>
    <p>Your account has no role that opens Walk, Board, Bench or Setup. Ask an admin of your site to give you one.</p>
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class NoDestinations {}

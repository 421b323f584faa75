import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';

/** Heading and "what will be here" list shared by the screens that later issues fill in. */
@Component({
  selector: 'fw-screen-intro',
  imports: [MatIconModule],
  template: `
    <h1><mat-icon aria-hidden="true">{{ icon() }}</mat-icon> {{ title() }}</h1>
    <p class="lead">{{ summary() }}</p>
    <h2>Coming to this screen</h2>
    <ul>
      @for (item of upcoming(); track item) {
        <li>{{ item }}</li>
      }
    </ul>
  `,
  styles: `
    h1 { display: flex; align-items: center; gap: 8px; font: var(--mat-sys-headline-medium); color: var(--mat-sys-primary); }
    h1 mat-icon { font-size: 32px; width: 32px; height: 32px; }
    .lead { font: var(--mat-sys-body-large); }
    h2 { font: var(--mat-sys-title-medium); }
    li { margin: 4px 0; }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ScreenIntro {
  readonly icon = input.required<string>();
  readonly title = input.required<string>();
  readonly summary = input.required<string>();
  readonly upcoming = input.required<readonly string[]>();
}

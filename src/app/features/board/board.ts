import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatSelectModule } from '@angular/material/select';
import { MatTabsModule } from '@angular/material/tabs';
import { SiteTimePipe } from '../../core/time/site-time-pipe';
import { AnomalyList } from './anomaly-list';
import { BoardMap } from './board-map';
import { BoardStore } from './board-store';
import { DeviceList } from './device-list';
import { DigestPanel } from './digest-panel';
import { PlanView } from './plan-view';
import { ProgressView } from './progress-view';
import { readyToClose } from './progress-rows';
import { RoundSelect } from './round-select';

/** The crew lead's screen: plan campaigns, see what every collar still needs, spot anomalies and silent devices, close a campaign. */
@Component({
  selector: 'fw-board',
  imports: [
    SiteTimePipe,
    MatButtonModule,
    MatFormFieldModule,
    MatSelectModule,
    MatTabsModule,
    AnomalyList,
    BoardMap,
    DeviceList,
    DigestPanel,
    PlanView,
    ProgressView,
    RoundSelect,
  ],
  providers: [BoardStore],
  template: `
    <h1>Board @if (store.site(); as s) { <span class="site">· {{ s.name }}</span> }</h1>
    <div class="bar">
      <mat-form-field subscriptSizing="dynamic" class="campaign">
        <mat-label>Campaign</mat-label>
        <mat-select [value]="store.campaignId()" (valueChange)="store.choose($event)" data-testid="campaign-select">
          @for (c of store.campaigns(); track c.id) {
            <mat-option [value]="c.id">{{ c.name }} ({{ c.startsOn }}){{ c.locked ? ' · closed' : '' }}</mat-option>
          }
        </mat-select>
      </mat-form-field>
      @if (store.campaign(); as c) {
        <fw-round-select [rounds]="c.rounds" [value]="store.round()" (chosen)="store.round.set($event)" />
      }
      <button mat-stroked-button type="button" (click)="store.loadSite()" [disabled]="store.loading()">Refresh</button>
      @if (store.campaign(); as c) {
        <span class="lock" data-testid="lock-state">{{ c.locked ? '🔒 Closed: field edits are refused' : 'Open for field work' }}</span>
        @if (c.locked) {
          <button mat-stroked-button type="button" (click)="store.setLocked(false)">Reopen campaign</button>
        } @else {
          <button mat-flat-button type="button" (click)="store.setLocked(true)" [disabled]="!canClose()"
            [attr.aria-describedby]="canClose() ? null : 'close-hint'">Close campaign</button>
          @if (!canClose()) { <span id="close-hint" class="hint">Closes when every collar is complete or skipped with a reason.</span> }
        }
      }
    </div>
    @if (store.offlineSince(); as at) {
      <p class="offline" role="status">No connection: showing the Board as it was at {{ at | siteTime: store.zone() }}.</p>
    }
    <p class="problem" role="alert">{{ store.problem() }}</p>

    <mat-tab-group class="fw-wrap-tabs" [preserveContent]="false" animationDuration="0ms" mat-stretch-tabs="false">
      <mat-tab label="Progress">
        <ng-template matTabContent>
          @if (store.campaign()) { <fw-progress-view /> } @else { <p>No campaign yet: plan one under Plan.</p> }
        </ng-template>
      </mat-tab>
      <mat-tab label="Plan"><ng-template matTabContent><fw-plan-view /></ng-template></mat-tab>
      <mat-tab label="Map"><ng-template matTabContent><fw-board-map /></ng-template></mat-tab>
      <mat-tab label="Anomalies"><ng-template matTabContent><fw-anomaly-list /></ng-template></mat-tab>
      <mat-tab label="Devices"><ng-template matTabContent><fw-device-list /></ng-template></mat-tab>
      <mat-tab label="Digest"><ng-template matTabContent><fw-digest-panel /></ng-template></mat-tab>
    </mat-tab-group>
  `,
  styles: `
    h1 { font: var(--mat-sys-headline-small); margin-block: .5rem; }
    .site { color: var(--mat-sys-on-surface-variant); }
    .bar { display: flex; flex-wrap: wrap; gap: .75rem; align-items: center; }
    .campaign { min-width: min(20rem, 100%); max-width: 100%; }
    .lock { font-weight: 600; }
    .hint { font-size: .85rem; color: var(--mat-sys-on-surface-variant); }
    .offline { background: #fff4d6; color: #3d2c00; padding: .5rem .75rem; border-radius: 6px; }
    .problem { color: var(--mat-sys-error); font-weight: 600; min-height: 1em; margin: .25rem 0; }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Board {
  protected readonly store = inject(BoardStore);
  protected readonly canClose = () => readyToClose(this.store.progress()?.collars ?? []) && this.store.round() === null;

  constructor() {
    this.store.show();
  }
}

import { NgTemplateOutlet } from '@angular/common';
import { ChangeDetectionStrategy, Component, OnInit, computed, inject } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatToolbarModule } from '@angular/material/toolbar';
import { RouterLink, RouterLinkActive, RouterOutlet } from '@angular/router';
import { AuthStore } from '../../core/auth/auth-store';
import { destinationsFor } from '../../core/auth/destinations';
import { SiteChoice } from '../../core/auth/site-choice';
import { DeviceDb } from '../../core/db/device-db';
import { SyncEngine } from '../../core/sync/sync-engine';
import { SyncIndicator } from '../../core/sync/sync-indicator';
import { SessionBanner } from './session-banner';
import { UserMenu } from './user-menu';

/** The frame around every signed-in screen: toolbar, role-based navigation, notices. */
@Component({
  selector: 'fw-shell',
  imports: [
    MatButtonModule,
    MatIconModule,
    MatToolbarModule,
    NgTemplateOutlet,
    RouterLink,
    RouterLinkActive,
    RouterOutlet,
    SessionBanner,
    SyncIndicator,
    UserMenu,
  ],
  templateUrl: './shell.html',
  styleUrl: './shell.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Shell implements OnInit {
  private readonly auth = inject(AuthStore);
  protected readonly site = inject(SiteChoice).current;
  protected readonly destinations = computed(() => destinationsFor(this.auth.roles()));
  /** With one destination there is nothing to switch between: its link joins the toolbar row. */
  protected readonly single = computed(() => this.destinations().length < 2);
  protected readonly deviceDb = inject(DeviceDb);
  private readonly sync = inject(SyncEngine);

  ngOnInit(): void {
    // Roles or sites may have changed since the remembered sign-in; offline this quietly fails.
    void this.auth.refresh();
    this.sync.start();
  }
}

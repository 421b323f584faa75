import { ChangeDetectionStrategy, Component, computed, inject, input, resource, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MatSlideToggleModule } from '@angular/material/slide-toggle';
import { MatTableModule } from '@angular/material/table';
import { RouterLink } from '@angular/router';
import { serverMessage } from '../../core/api/api-error';
import { loadedOr, loadProblem } from '../../core/api/resource-value';
import { SetupApi, type UserRow } from './setup-api';

const ROLES = ['crew', 'lead', 'lab', 'admin'] as const;

/** Who works on the site: membership, roles and disabling a user (admins only). */
@Component({
  selector: 'fw-members',
  imports: [MatButtonModule, MatTableModule, MatCheckboxModule, MatSlideToggleModule, RouterLink],
  template: `
    <section aria-labelledby="members-heading">
      <h3 id="members-heading">Members and roles</h3>
      <p><a matButton="outlined" routerLink="/accounts/invite" [queryParams]="{ siteId: siteId() }">Invite someone by e-mail</a></p>
      <div class="fw-table-box" tabindex="0" role="region" aria-label="Members and roles, scrolls sideways">
      <table mat-table [dataSource]="users()">
        <ng-container matColumnDef="name">
          <th mat-header-cell *matHeaderCellDef>Name</th>
          <td mat-cell *matCellDef="let u">{{ u.displayName }} <span class="email">{{ u.email }}</span></td>
        </ng-container>
        <ng-container matColumnDef="member">
          <th mat-header-cell *matHeaderCellDef>Member of this site</th>
          <td mat-cell *matCellDef="let u">
            <mat-checkbox [checked]="u.siteIds.includes(siteId())" [disabled]="seesAll(u)" (change)="setMember(u, $event.checked)"
              [aria-label]="u.displayName + ' is a member of this site'" />
          </td>
        </ng-container>
        <ng-container matColumnDef="roles">
          <th mat-header-cell *matHeaderCellDef>Roles</th>
          <td mat-cell *matCellDef="let u">
            <div class="roles">
            @for (r of roles; track r) {
              <mat-checkbox [checked]="u.roles.includes(r)" (change)="setRole(u, r, $event.checked)" [aria-label]="u.displayName + ' has role ' + r">{{ r }}</mat-checkbox>
            }
            </div>
          </td>
        </ng-container>
        <ng-container matColumnDef="disabled">
          <th mat-header-cell *matHeaderCellDef>Disabled</th>
          <td mat-cell *matCellDef="let u">
            <mat-slide-toggle [checked]="!!u.disabled" (change)="setDisabled(u, $event.checked)" [aria-label]="'Disable ' + u.displayName" />
          </td>
        </ng-container>
        <tr mat-header-row *matHeaderRowDef="columns"></tr>
        <tr mat-row *matRowDef="let row; columns: columns"></tr>
      </table>
      </div>
      <p role="status">{{ message() }}</p>
    </section>
  `,
  styles: `.email { display: block; font-size: .85rem; opacity: .8; } table { width: 100%; }
    .roles { display: flex; flex-wrap: wrap; min-width: 12rem; }`,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Members {
  private readonly api = inject(SetupApi);
  readonly siteId = input.required<string>();
  protected readonly roles = ROLES;
  protected readonly columns = ['name', 'member', 'roles', 'disabled'];
  /** Every user, asked again when another site is shown. */
  private readonly list = resource({ params: () => this.siteId(), loader: () => this.api.users() });
  protected readonly users = loadedOr(this.list, []);
  private readonly saveMessage = signal('');
  private readonly loadMessage = loadProblem(this.list, 'Could not load the users');
  protected readonly message = computed(() => this.loadMessage() || this.saveMessage());

  /** Lab and admin see every site; membership is for crew and leads. */
  protected seesAll(u: UserRow): boolean {
    return u.roles.includes('lab') || u.roles.includes('admin');
  }

  private async change(u: UserRow, changes: Partial<UserRow>, done: string): Promise<void> {
    try {
      const saved = await this.api.updateUser(u.id, changes);
      this.list.update((all) => all?.map((x) => (x.id === u.id ? { ...x, ...saved } : x)));
      this.saveMessage.set(done);
    } catch (err) {
      this.saveMessage.set(serverMessage(err, 'Not changed'));
    }
  }

  protected setMember(u: UserRow, member: boolean): Promise<void> {
    const siteIds = member ? [...new Set([...u.siteIds, this.siteId()])] : u.siteIds.filter((s) => s !== this.siteId());
    return this.change(u, { siteIds }, `${u.displayName} ${member ? 'added to' : 'removed from'} this site`);
  }

  protected setRole(u: UserRow, role: string, on: boolean): Promise<void> {
    const roles = on ? [...new Set([...u.roles, role])] : u.roles.filter((r) => r !== role);
    return this.change(u, { roles }, `${u.displayName}'s roles saved`);
  }

  protected setDisabled(u: UserRow, disabled: boolean): Promise<void> {
    return this.change(u, { disabled }, `${u.displayName} ${disabled ? 'disabled' : 'enabled'}`);
  }
}

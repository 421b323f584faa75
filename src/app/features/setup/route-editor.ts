import { ChangeDetectionStrategy, Component, computed, inject, input, resource, signal } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { routeFields } from '../../../../shared/model/field-records';
import { serverMessage } from '../../core/api/api-error';
import { issuesByField } from './record-fields';
import type { StoredRecord } from '../../../../shared/model/stored-record';
import { loadedOr, loadProblem } from '../../core/api/resource-value';
import { SetupApi } from './setup-api';

type Route = StoredRecord<'route'>;

/** Routes of a site: the ordered collars a crew walks (leads and admins). */
@Component({
  selector: 'fw-route-editor',
  imports: [ReactiveFormsModule, MatButtonModule, MatFormFieldModule, MatIconModule, MatInputModule, MatSelectModule],
  template: `
    <section aria-labelledby="routes-heading">
      <h3 id="routes-heading">Routes</h3>
      <ul>
        @for (r of routes(); track r.id) {
          <li><button mat-button type="button" (click)="edit(r)">{{ r.name }}</button> · {{ r.collarIds.length }} collars</li>
        } @empty { <li>No routes yet.</li> }
      </ul>
      <form [formGroup]="form" (ngSubmit)="save()" aria-label="Route">
        <mat-form-field>
          <mat-label>Route name</mat-label>
          <input matInput formControlName="name" />
          @if (errors()['name']) { <mat-hint class="problem">{{ errors()['name'] }}</mat-hint> }
        </mat-form-field>
        <mat-form-field>
          <mat-label>Add a collar</mat-label>
          <mat-select [value]="null" (valueChange)="addCollar($event)">
            @for (c of available(); track c.id) { <mat-option [value]="c.id">{{ c.code }}</mat-option> }
          </mat-select>
        </mat-form-field>
        <ol class="order" aria-label="Collars in walking order">
          @for (id of order(); track id; let i = $index) {
            <li>
              {{ code(id) }}
              <button mat-icon-button type="button" (click)="move(i, -1)" [disabled]="i === 0" [attr.aria-label]="'Move ' + code(id) + ' up'"><mat-icon aria-hidden="true">arrow_upward</mat-icon></button>
              <button mat-icon-button type="button" (click)="move(i, 1)" [disabled]="i === order().length - 1" [attr.aria-label]="'Move ' + code(id) + ' down'"><mat-icon aria-hidden="true">arrow_downward</mat-icon></button>
              <button mat-icon-button type="button" (click)="remove(id)" [attr.aria-label]="'Remove ' + code(id)"><mat-icon aria-hidden="true">close</mat-icon></button>
            </li>
          }
        </ol>
        <button mat-flat-button type="submit">{{ editing() ? 'Save route' : 'Create route' }}</button>
        @if (editing()) { <button mat-button type="button" (click)="reset()">New route</button> }
      </form>
      <p role="status">{{ message() }}</p>
    </section>
  `,
  styles: `.order li { display: flex; align-items: center; gap: .25rem; } .problem { color: var(--mat-sys-error); }`,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class RouteEditor {
  private readonly api = inject(SetupApi);
  readonly siteId = input.required<string>();
  /** A new value loads routes and collars again (after an import). */
  readonly reloadToken = input(0);
  private readonly lists = resource({
    params: () => ({ siteId: this.siteId(), reload: this.reloadToken() }),
    loader: async ({ params: { siteId } }) => {
      const [routes, collars] = await Promise.all([this.api.list('route', { siteId }), this.api.list('collar', { siteId })]);
      return { routes, collars };
    },
  });
  private readonly loaded = loadedOr(this.lists, { routes: [], collars: [] });
  protected readonly routes = computed(() => this.loaded().routes);
  private readonly collars = computed(() => this.loaded().collars);
  protected readonly form = new FormGroup({
    name: new FormControl('', { nonNullable: true }),
    /** The collars in walking order. */
    collarIds: new FormControl<string[]>([], { nonNullable: true }),
  });
  protected readonly order = toSignal(this.form.controls.collarIds.valueChanges, { initialValue: [] });
  protected readonly editing = signal<Route | null>(null);
  protected readonly errors = signal<Record<string, string>>({});
  private readonly saveMessage = signal('');
  private readonly loadMessage = loadProblem(this.lists, 'Could not load the routes');
  protected readonly message = computed(() => this.loadMessage() || this.saveMessage());
  private readonly codes = computed(() => new Map(this.collars().map((c) => [c.id, c.code])));
  protected readonly available = computed(() => this.collars().filter((c) => !this.order().includes(c.id)));

  protected code(id: string): string {
    return this.codes().get(id) ?? '(removed collar)';
  }

  private setOrder(ids: string[]): void {
    this.form.controls.collarIds.setValue(ids);
  }

  protected remove(id: string): void {
    this.setOrder(this.order().filter((x) => x !== id));
  }

  protected addCollar(id: string | null): void {
    if (id) this.setOrder([...this.order(), id]);
  }

  protected move(i: number, by: number): void {
    const next = [...this.order()];
    [next[i], next[i + by]] = [next[i + by]!, next[i]!];
    this.setOrder(next);
  }

  protected edit(r: Route): void {
    this.editing.set(r);
    this.form.setValue({ name: r.name, collarIds: [...r.collarIds] });
  }

  protected reset(): void {
    this.editing.set(null);
    this.form.reset();
  }

  protected async save(): Promise<void> {
    const { name, collarIds } = this.form.getRawValue();
    const fields = { siteId: this.siteId(), name, collarIds };
    const check = routeFields.safeParse(fields);
    if (!check.success) return this.errors.set(issuesByField(check.error.issues));
    try {
      const current = this.editing();
      const saved = current
        ? await this.api.update('route', current.id, current.rev, { name, collarIds })
        : await this.api.create('route', fields);
      this.lists.update((l) => l && { ...l, routes: [...l.routes.filter((r) => r.id !== saved.id), saved] });
      this.saveMessage.set(`Route ${saved.name} saved`);
      this.reset();
    } catch (err) {
      this.saveMessage.set(serverMessage(err, 'The route was not saved'));
    }
  }
}

import { ChangeDetectionStrategy, Component, computed, effect, inject, input, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { routeFields } from '../../../../shared/model/field-records';
import { serverMessage } from '../../core/api/api-error';
import { issuesByField } from './record-fields';
import { SetupApi, type Rec } from './setup-api';

/** Routes of a site: the ordered collars a crew walks (leads and admins). */
@Component({
  selector: 'fw-route-editor',
  imports: [MatButtonModule, MatFormFieldModule, MatIconModule, MatInputModule, MatSelectModule],
  template: `
    <section aria-labelledby="routes-heading">
      <h3 id="routes-heading">Routes</h3>
      <ul>
        @for (r of routes(); track r.id) {
          <li><button mat-button type="button" (click)="edit(r)">{{ r['name'] }}</button> · {{ $any(r['collarIds']).length }} collars</li>
        } @empty { <li>No routes yet.</li> }
      </ul>
      <form (submit)="$event.preventDefault(); save()" aria-label="Route">
        <mat-form-field>
          <mat-label>Route name</mat-label>
          <input matInput [value]="name()" (input)="name.set($any($event.target).value)" />
          @if (errors()['name']) { <mat-hint class="problem">{{ errors()['name'] }}</mat-hint> }
        </mat-form-field>
        <mat-form-field>
          <mat-label>Add a collar</mat-label>
          <mat-select [value]="null" (valueChange)="addCollar($event)">
            @for (c of available(); track c.id) { <mat-option [value]="c.id">{{ c['code'] }}</mat-option> }
          </mat-select>
        </mat-form-field>
        <ol class="order" aria-label="Collars in walking order">
          @for (id of order(); track id; let i = $index) {
            <li>
              {{ code(id) }}
              <button mat-icon-button type="button" (click)="move(i, -1)" [disabled]="i === 0" [attr.aria-label]="'Move ' + code(id) + ' up'"><mat-icon aria-hidden="true">arrow_upward</mat-icon></button>
              <button mat-icon-button type="button" (click)="move(i, 1)" [disabled]="i === order().length - 1" [attr.aria-label]="'Move ' + code(id) + ' down'"><mat-icon aria-hidden="true">arrow_downward</mat-icon></button>
              <button mat-icon-button type="button" (click)="order.set(without(id))" [attr.aria-label]="'Remove ' + code(id)"><mat-icon aria-hidden="true">close</mat-icon></button>
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
  readonly reloadToken = input(0);
  protected readonly routes = signal<Rec[]>([]);
  protected readonly collars = signal<Rec[]>([]);
  protected readonly name = signal('');
  protected readonly order = signal<string[]>([]);
  protected readonly editing = signal<Rec | null>(null);
  protected readonly errors = signal<Record<string, string>>({});
  protected readonly message = signal('');
  private readonly codes = computed(() => new Map(this.collars().map((c) => [c.id, String(c['code'])])));
  protected readonly available = computed(() => this.collars().filter((c) => !this.order().includes(c.id)));

  constructor() {
    effect(() => {
      this.reloadToken();
      void this.load(this.siteId());
    });
  }

  private async load(siteId: string): Promise<void> {
    try {
      const [routes, collars] = await Promise.all([this.api.list('routes', { siteId }), this.api.list('collars', { siteId })]);
      this.routes.set(routes);
      this.collars.set(collars);
    } catch (err) {
      this.message.set(serverMessage(err, 'Could not load the routes'));
    }
  }

  protected code(id: string): string {
    return this.codes().get(id) ?? '(removed collar)';
  }

  protected without(id: string): string[] {
    return this.order().filter((x) => x !== id);
  }

  protected addCollar(id: string | null): void {
    if (id) this.order.update((o) => [...o, id]);
  }

  protected move(i: number, by: number): void {
    this.order.update((o) => {
      const next = [...o];
      [next[i], next[i + by]] = [next[i + by]!, next[i]!];
      return next;
    });
  }

  protected edit(r: Rec): void {
    this.editing.set(r);
    this.name.set(String(r['name']));
    this.order.set([...(r['collarIds'] as string[])]);
  }

  protected reset(): void {
    this.editing.set(null);
    this.name.set('');
    this.order.set([]);
  }

  protected async save(): Promise<void> {
    const fields = { siteId: this.siteId(), name: this.name(), collarIds: this.order() };
    const check = routeFields.safeParse(fields);
    if (!check.success) return this.errors.set(issuesByField(check.error.issues));
    try {
      const current = this.editing();
      const saved = current
        ? await this.api.update('routes', current.id, current.rev, { name: fields.name, collarIds: fields.collarIds })
        : await this.api.create('routes', fields);
      this.routes.update((rs) => [...rs.filter((r) => r.id !== saved.id), saved]);
      this.message.set(`Route ${String(saved['name'])} saved`);
      this.reset();
    } catch (err) {
      this.message.set(serverMessage(err, 'The route was not saved'));
    }
  }
}

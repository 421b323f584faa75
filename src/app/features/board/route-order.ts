import { CdkDrag, CdkDragDrop, CdkDragHandle, CdkDropList, moveItemInArray } from '@angular/cdk/drag-drop';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatSelectModule } from '@angular/material/select';
import { serverMessage } from '../../core/api/api-error';
import { BoardApi } from './board-api';
import { BoardStore } from './board-store';

/**
 * A route's walking order: drag a collar to its new place (CDK drag and drop), or move it with
 * the up/down buttons from the keyboard; saved with the route's rev like any other edit.
 */
@Component({
  selector: 'fw-route-order',
  imports: [CdkDropList, CdkDrag, CdkDragHandle, MatButtonModule, MatFormFieldModule, MatSelectModule],
  template: `
    <section aria-labelledby="order-heading">
      <h2 id="order-heading">Route order</h2>
      <mat-form-field subscriptSizing="dynamic">
        <mat-label>Route to reorder</mat-label>
        <mat-select [value]="routeId()" (valueChange)="pick($event)" data-testid="order-route">
          @for (r of store.routes(); track r.id) { <mat-option [value]="r.id">{{ r.name }}</mat-option> }
        </mat-select>
      </mat-form-field>
      @if (routeId()) {
        <ol cdkDropList class="stops" (cdkDropListDropped)="drop($event)" aria-label="Collars in walking order" data-testid="order-list">
          @for (id of order(); track id; let i = $index, last = $last) {
            <li cdkDrag class="stop" [attr.data-collar]="code(id)">
              <span cdkDragHandle class="handle" aria-hidden="true">⠿</span>
              <span class="n">{{ i + 1 }}.</span><span class="code">{{ code(id) }}</span>
              <button mat-button type="button" (click)="move(i, -1)" [disabled]="i === 0" [attr.aria-label]="'Move ' + code(id) + ' up'">Up</button>
              <button mat-button type="button" (click)="move(i, 1)" [disabled]="last" [attr.aria-label]="'Move ' + code(id) + ' down'">Down</button>
            </li>
          }
        </ol>
        <button mat-flat-button type="button" (click)="save()" [disabled]="!dirty()">Save order</button>
        <button mat-button type="button" (click)="pick(routeId())" [disabled]="!dirty()">Undo changes</button>
      }
      <p role="alert" class="problem">{{ problem() }}</p>
      <p role="status" data-testid="order-status">{{ status() }}</p>
    </section>
  `,
  styles: `
    .stops { list-style: none; padding: 0; max-height: 420px; overflow: auto; border: 1px solid var(--mat-sys-outline-variant); border-radius: 8px; }
    .stop { display: grid; grid-template-columns: 1.5rem 3rem 1fr auto auto; align-items: center; gap: .5rem; padding: 2px .5rem;
      background: var(--mat-sys-surface); border-bottom: 1px solid var(--mat-sys-outline-variant); }
    .handle { cursor: grab; font-size: 1.2rem; }
    .code { font-weight: 600; }
    .cdk-drag-preview { box-shadow: 0 4px 12px rgb(0 0 0 / 30%); }
    .cdk-drag-placeholder { opacity: .3; }
    .problem { color: var(--mat-sys-error); font-weight: 600; }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class RouteOrder {
  protected readonly store = inject(BoardStore);
  private readonly api = inject(BoardApi);
  protected readonly routeId = signal<string | null>(null);
  protected readonly order = signal<string[]>([]);
  protected readonly status = signal('');
  protected readonly problem = signal('');
  private readonly codes = computed(() => new Map(this.store.collars().map((c) => [c.id, c.code])));
  private readonly route = computed(() => this.store.routes().find((r) => r.id === this.routeId()) ?? null);
  protected readonly dirty = computed(() => {
    const saved = this.route()?.collarIds ?? [];
    return saved.join() !== this.order().join();
  });

  protected code(id: string): string {
    return this.codes().get(id) ?? id.slice(0, 8);
  }

  protected pick(id: string | null): void {
    this.routeId.set(id);
    this.order.set([...(this.route()?.collarIds ?? [])]);
    this.status.set('');
    this.problem.set('');
  }

  protected drop(e: CdkDragDrop<unknown>): void {
    const next = [...this.order()];
    moveItemInArray(next, e.previousIndex, e.currentIndex);
    this.order.set(next);
  }

  protected move(i: number, by: number): void {
    const next = [...this.order()];
    moveItemInArray(next, i, i + by);
    this.order.set(next);
  }

  protected async save(): Promise<void> {
    const r = this.route();
    if (!r) return;
    this.problem.set('');
    try {
      const saved = await this.api.update('route', r.id, r.rev, { collarIds: this.order() });
      this.store.replaceRoute(saved);
      this.store.reloadProgress();
      this.status.set(`Order of "${saved.name}" saved.`);
    } catch (err) {
      this.problem.set(serverMessage(err, 'The order could not be saved'));
    }
  }
}

import { ChangeDetectionStrategy, Component, computed, effect, inject, input, signal, untracked } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { toSignal } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { ENTITY_FIELDS } from '../../../../shared/model/entities';
import type { COLLAR_EVENT_KINDS } from '../../../../shared/model/field-records';
import { siteToday } from '../../../../shared/time/site-time';
import { AuthStore } from '../../core/auth/auth-store';
import { liveSignal } from '../../core/db/live-query-signal';
import { LocalWrites } from '../../core/sync/local-writes';

/** Events a crew records after the install ("installed" comes with the install form). */
export const LATER_EVENTS = [
  { kind: 'clipped', label: 'Vegetation clipped' },
  { kind: 'reseated', label: 'Reseated' },
  { kind: 'replaced', label: 'Replaced by a new collar' },
  { kind: 'damaged', label: 'Damaged' },
  { kind: 'retired', label: 'Retired' },
] as const satisfies readonly { kind: (typeof COLLAR_EVENT_KINDS)[number]; label: string }[];
type LaterKind = (typeof LATER_EVENTS)[number]['kind'];

/** A collar's life: its events, newest first, and a form for the next one (saved on the device first). */
@Component({
  selector: 'fw-collar-events',
  imports: [ReactiveFormsModule, MatButtonModule, MatFormFieldModule, MatInputModule, MatSelectModule],
  template: `
    <ol class="events" data-testid="collar-events">
      @for (e of events(); track e.id) {
        <li><strong>{{ e.date }}</strong> {{ labelOf(e.kind) }}@if (e.note) { — {{ e.note }} }</li>
      } @empty { <li>No events recorded.</li> }
    </ol>
    <form [formGroup]="form" (submit)="$event.preventDefault(); addEvent()">
      <mat-form-field appearance="outline" class="wide">
        <mat-label>What happened</mat-label>
        <mat-select formControlName="kind">
          @for (k of kinds; track k.kind) { <mat-option [value]="k.kind">{{ k.label }}</mat-option> }
        </mat-select>
      </mat-form-field>
      @if (kind() === 'replaced') {
        <mat-form-field appearance="outline" class="wide">
          <mat-label>New collar</mat-label>
          <mat-select formControlName="replacedById">
            @for (c of others(); track c.id) { <mat-option [value]="c.id">{{ c.code }}</mat-option> }
          </mat-select>
        </mat-form-field>
      }
      <mat-form-field appearance="outline" class="wide">
        <mat-label>Date</mat-label>
        <input matInput type="date" formControlName="date" />
      </mat-form-field>
      <mat-form-field appearance="outline" class="wide">
        <mat-label>Event note</mat-label>
        <textarea matInput rows="2" maxlength="2000" formControlName="note"></textarea>
      </mat-form-field>
      <button mat-flat-button type="submit">Record event</button>
      @if (problem()) { <p role="alert" class="problem">{{ problem() }}</p> }
      @if (message()) { <p role="status">{{ message() }}</p> }
    </form>
  `,
  styles: `.wide { width: 100%; } button { min-height: 48px; } .events { padding-left: 20px; } .problem { font-weight: 600; color: var(--mat-sys-error); }`,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CollarEvents {
  readonly collarId = input.required<string>();
  readonly siteId = input.required<string>();
  private readonly writes = inject(LocalWrites);
  private readonly auth = inject(AuthStore);
  protected readonly kinds = LATER_EVENTS;
  protected readonly events = liveSignal(
    () => this.collarId(),
    async (db, id) =>
      (await db.records('collarEvent').where('collarId').equals(id).toArray())
        .filter((e) => !e.deleted)
        .sort((a, b) => b.date.localeCompare(a.date)),
    [],
  );
  private readonly siteCollars = liveSignal(
    () => this.siteId(),
    async (db, id) => db.records('collar').where('siteId').equals(id).toArray(),
    [],
  );
  protected readonly others = computed(() =>
    this.siteCollars()
      .filter((c) => c.id !== this.collarId())
      .sort((a, b) => a.code.localeCompare(b.code, undefined, { numeric: true })),
  );
  protected readonly form = new FormGroup({
    kind: new FormControl<LaterKind>('clipped', { nonNullable: true }),
    replacedById: new FormControl<string | null>(null),
    date: new FormControl('', { nonNullable: true }),
    note: new FormControl('', { nonNullable: true }),
  });
  protected readonly kind = toSignal(this.form.controls.kind.valueChanges, { initialValue: this.form.controls.kind.value });
  /** Today at the collar's site (not on the phone). */
  private readonly today = computed(() => siteToday(this.auth.sites().find((s) => s.id === this.siteId())?.timezone ?? 'UTC'));
  protected readonly problem = signal('');
  protected readonly message = signal('');

  constructor() {
    // Pushes the site's today into the form (not a load): offered until the crew picks another day.
    effect(() => {
      const today = this.today();
      untracked(() => this.form.controls.date.setValue(today));
    });
  }

  protected labelOf(kind: (typeof COLLAR_EVENT_KINDS)[number]): string {
    return kind === 'installed' ? 'Installed' : (LATER_EVENTS.find((k) => k.kind === kind)?.label ?? kind);
  }

  protected async addEvent(): Promise<void> {
    const v = this.form.getRawValue();
    const fields = {
      siteId: this.siteId(),
      collarId: this.collarId(),
      kind: v.kind,
      date: v.date,
      note: v.note.trim(),
      replacedById: v.kind === 'replaced' ? v.replacedById : null,
    };
    const parsed = ENTITY_FIELDS.collarEvent.safeParse(fields);
    if (!parsed.success) {
      this.problem.set(parsed.error.issues.map((i) => i.message).join('; '));
      return;
    }
    this.problem.set('');
    try {
      await this.writes.create('collarEvent', parsed.data);
      this.message.set('Event saved on this device.');
      this.form.controls.note.reset();
    } catch (err) {
      this.problem.set(err instanceof Error ? err.message : 'Could not save on this device');
    }
  }
}

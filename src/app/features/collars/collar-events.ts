import { ChangeDetectionStrategy, Component, computed, inject, input, linkedSignal, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { ENTITY_FIELDS } from '../../../../shared/model/entities';
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
] as const;

/** A collar's life: its events, newest first, and a form for the next one (saved on the device first). */
@Component({
  selector: 'fw-collar-events',
  imports: [MatButtonModule, MatFormFieldModule, MatInputModule, MatSelectModule],
  template: `
    <ol class="events" data-testid="collar-events">
      @for (e of events(); track e.id) {
        <li><strong>{{ e['date'] }}</strong> {{ labelOf(e['kind']) }}@if (e['note']) { — {{ e['note'] }} }</li>
      } @empty { <li>No events recorded.</li> }
    </ol>
    <form (submit)="$event.preventDefault(); addEvent()">
      <mat-form-field appearance="outline" class="wide">
        <mat-label>What happened</mat-label>
        <mat-select [value]="kind()" (selectionChange)="kind.set($event.value)">
          @for (k of kinds; track k.kind) { <mat-option [value]="k.kind">{{ k.label }}</mat-option> }
        </mat-select>
      </mat-form-field>
      @if (kind() === 'replaced') {
        <mat-form-field appearance="outline" class="wide">
          <mat-label>New collar</mat-label>
          <mat-select [value]="replacedById()" (selectionChange)="replacedById.set($event.value)">
            @for (c of others(); track c.id) { <mat-option [value]="c.id">{{ c['code'] }}</mat-option> }
          </mat-select>
        </mat-form-field>
      }
      <mat-form-field appearance="outline" class="wide">
        <mat-label>Date</mat-label>
        <input matInput type="date" [value]="date()" (input)="date.set($any($event.target).value)" />
      </mat-form-field>
      <mat-form-field appearance="outline" class="wide">
        <mat-label>Event note</mat-label>
        <textarea matInput rows="2" maxlength="2000" [value]="note()" (input)="note.set($any($event.target).value)"></textarea>
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
        .sort((a, b) => String(b['date']).localeCompare(String(a['date']))),
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
      .sort((a, b) => String(a['code']).localeCompare(String(b['code']), undefined, { numeric: true })),
  );
  protected readonly kind = signal<string>('clipped');
  /** Today at the collar's site (not on the phone), until the crew picks another day. */
  protected readonly date = linkedSignal(() => siteToday(this.auth.sites().find((s) => s.id === this.siteId())?.timezone ?? 'UTC'));
  protected readonly note = signal('');
  protected readonly replacedById = signal<string | null>(null);
  protected readonly problem = signal('');
  protected readonly message = signal('');

  protected labelOf(kind: unknown): string {
    return kind === 'installed' ? 'Installed' : (LATER_EVENTS.find((k) => k.kind === kind)?.label ?? String(kind));
  }

  protected async addEvent(): Promise<void> {
    const fields = {
      siteId: this.siteId(),
      collarId: this.collarId(),
      kind: this.kind(),
      date: this.date(),
      note: this.note().trim(),
      replacedById: this.kind() === 'replaced' ? this.replacedById() : null,
    };
    const parsed = ENTITY_FIELDS.collarEvent.safeParse(fields);
    if (!parsed.success) {
      this.problem.set(parsed.error.issues.map((i) => i.message).join('; '));
      return;
    }
    this.problem.set('');
    try {
      await this.writes.create('collarEvent', parsed.data as Record<string, unknown>);
      this.message.set('Event saved on this device.');
      this.note.set('');
    } catch (err) {
      this.problem.set(err instanceof Error ? err.message : 'Could not save on this device');
    }
  }
}

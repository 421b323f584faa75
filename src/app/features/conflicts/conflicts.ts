import { ChangeDetectionStrategy, Component, inject, signal, computed } from '@angular/core';
import { FormControl, FormRecord, ReactiveFormsModule } from '@angular/forms';
import { SiteTimePipe } from '../../core/time/site-time-pipe';
import { SiteChoice } from '../../core/auth/site-choice';
import { MatButtonModule } from '@angular/material/button';
import { MatRadioModule } from '@angular/material/radio';
import { AuthStore } from '../../core/auth/auth-store';
import type { ConflictRow, RecordBag } from '../../core/db/db-schema';
import type { Side } from '../../core/db/conflict-resolve';
import { liveSignal } from '../../core/db/live-query-signal';
import { LocalWrites } from '../../core/sync/local-writes';
import { fieldLabel, labelsFor } from '../../core/sync/op-labels';
import { conflictFieldRows, type ConflictFieldRow } from './conflict-rows';

interface ConflictCard {
  row: ConflictRow;
  label: string;
  fields: ConflictFieldRow[];
  alsoSent: string[];
  theirsAt: string | null;
  theirsBy: string;
}

/**
 * Changes the server could not merge because someone else changed the same fields. Each field
 * shows base, mine and theirs; the person keeps mine, keeps theirs, or picks per field, and the
 * result goes out as a new op on the server's rev.
 */
@Component({
  selector: 'fw-conflicts',
  imports: [SiteTimePipe, ReactiveFormsModule, MatButtonModule, MatRadioModule],
  templateUrl: './conflicts.html',
  styleUrl: './conflicts.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Conflicts {
  private readonly siteChoiceForTimes = inject(SiteChoice);
  /** Times shown here are the chosen site's wall time, zone named. */
  protected readonly zone = computed(() => this.siteChoiceForTimes.current()?.timezone ?? 'UTC');
  private readonly writes = inject(LocalWrites);
  private readonly auth = inject(AuthStore);
  /** The person's pick per conflict (op id) and field: mine, theirs, or not yet picked. */
  protected readonly picks = new FormRecord<FormRecord<FormControl<Side | null>>>({});
  protected readonly problem = signal('');

  protected readonly cards = liveSignal(
    () => this.auth.user()?.id ?? null,
    async (db, me) => {
      const rows = await db.conflicts.orderBy('opId').toArray();
      const labels = await labelsFor(
        db,
        rows.map((r) => ({ entity: r.entity, id: r.recordId })),
      );
      const cards: ConflictCard[] = [];
      for (const row of rows) {
        // The server's copy as the conflict reported it, else the copy on this device: an entity named at run time (untyped bag).
        const theirs: RecordBag | null = row.theirs
          ? { ...row.theirs, id: row.recordId, rev: row.serverRev }
          : ((await db.anyRecords(row.entity).get(row.recordId)) ?? null);
        const by = theirs?.updatedBy;
        cards.push({
          row,
          label: labels.get(`${row.entity}:${row.recordId}`) ?? row.entity,
          fields: conflictFieldRows({ ...row, theirs }),
          alsoSent: Object.keys(row.mine)
            .filter((k) => !row.fields.includes(k))
            .map(fieldLabel),
          theirsAt: theirs?.updatedAt ?? null,
          theirsBy: by && by === me ? 'you, on another device' : 'another person',
        });
      }
      return cards.sort((a, b) => a.row.at.localeCompare(b.row.at));
    },
    undefined as ConflictCard[] | undefined,
  );

  /** The control of one field's pick, made the first time the field is shown. */
  protected pickControl(opId: string, field: string): FormControl<Side | null> {
    let card = this.picks.controls[opId];
    if (!card) {
      card = new FormRecord<FormControl<Side | null>>({});
      this.picks.setControl(opId, card, { emitEvent: false });
    }
    let control = card.controls[field];
    if (!control) {
      control = new FormControl<Side | null>(null);
      card.setControl(field, control, { emitEvent: false });
    }
    return control;
  }

  protected picked(opId: string, field: string): Side | null {
    return this.picks.controls[opId]?.controls[field]?.value ?? null;
  }

  protected allPicked(card: ConflictCard): boolean {
    return card.fields.every((f) => this.picked(card.row.opId, f.field) !== null);
  }

  protected async keepAll(card: ConflictCard, side: Side): Promise<void> {
    await this.resolve(card, Object.fromEntries(card.fields.map((f) => [f.field, side])));
  }

  protected async usePicks(card: ConflictCard): Promise<void> {
    if (!this.allPicked(card)) {
      this.problem.set('Pick mine or theirs for every field first.');
      return;
    }
    await this.resolve(card, Object.fromEntries(card.fields.map((f) => [f.field, this.picked(card.row.opId, f.field) ?? 'mine'])));
  }

  private async resolve(card: ConflictCard, choice: Record<string, Side>): Promise<void> {
    this.problem.set('');
    try {
      await this.writes.resolve(card.row, choice);
    } catch (err) {
      this.problem.set(err instanceof Error ? err.message : 'The choice could not be saved on this device');
    }
  }
}

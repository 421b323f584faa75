import { ChangeDetectionStrategy, Component, effect, inject, input, signal, untracked, computed } from '@angular/core';
import { SiteTimePipe } from '../../core/time/site-time-pipe';
import { SiteChoice } from '../../core/auth/site-choice';
import { FormControl, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { RouterLink } from '@angular/router';
import type { EntityFields } from '../../../../shared/model/entities';
import { AuthStore } from '../../core/auth/auth-store';
import { LocalWrites } from '../../core/sync/local-writes';
import { CollarEvents } from './collar-events';
import { CollarPhotos } from './collar-photos';
import { collarView } from './collar-query';

/**
 * One collar: code, plot, treatment, last visit; notes and "report damaged" are editable by the
 * crew. Saving writes to the device first, so it works the same offline. Record text is shown by
 * interpolation only (never as HTML).
 */
@Component({
  selector: 'fw-collar-page',
  imports: [
    CollarEvents,
    CollarPhotos,
    SiteTimePipe,
    MatButtonModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    ReactiveFormsModule,
    RouterLink,
  ],
  templateUrl: './collar-page.html',
  styleUrl: './collar-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CollarPage {
  private readonly siteChoiceForTimes = inject(SiteChoice);
  /** Times shown here are the chosen site's wall time, zone named. */
  protected readonly zone = computed(() => this.siteChoiceForTimes.current()?.timezone ?? 'UTC');
  readonly id = input.required<string>();
  private readonly writes = inject(LocalWrites);
  private readonly auth = inject(AuthStore);
  protected readonly view = collarView(() => this.id());

  protected readonly notes = new FormControl('', { nonNullable: true, validators: Validators.maxLength(4000) });
  protected readonly reason = new FormControl('', { nonNullable: true, validators: [Validators.required, Validators.maxLength(1000)] });
  protected readonly reporting = signal(false);
  protected readonly message = signal('');
  protected readonly problem = signal('');
  private shownNotes: string | null = null;

  constructor() {
    // Pushes the stored note into the form (the data itself is a live query): it follows the
    // stored note unless the person is in the middle of changing it.
    effect(() => {
      const stored = this.view()?.collar.notes ?? '';
      untracked(() => {
        if (this.shownNotes === null || this.notes.value === this.shownNotes) this.notes.setValue(stored);
        this.shownNotes = stored;
      });
    });
  }

  protected canReport(): boolean {
    return this.auth.roles().some((r) => r === 'crew' || r === 'lead');
  }

  protected async saveNotes(): Promise<void> {
    if (this.notes.invalid) return;
    await this.write({ notes: this.notes.value }, 'Notes saved on this device');
  }

  protected async reportDamaged(): Promise<void> {
    this.reason.markAsTouched();
    if (this.reason.invalid) return;
    await this.write({ status: 'damaged', statusReason: this.reason.value.trim() }, 'Reported damaged on this device');
    this.reporting.set(false);
    this.reason.reset();
  }

  private async write(changes: Partial<EntityFields<'collar'>>, done: string): Promise<void> {
    this.problem.set('');
    try {
      const op = await this.writes.edit('collar', this.id(), changes);
      this.message.set(op ? `${done}; it goes to the server at the next sync.` : 'Nothing changed.');
    } catch (err) {
      this.problem.set(err instanceof Error ? err.message : 'The change could not be saved on this device');
    }
  }
}

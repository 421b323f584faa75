import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { plannedTagCodes } from '../../../../shared/model/collar-tag';
import { fieldProblems, serverMessage } from '../../core/api/api-error';
import { saveFile } from '../../core/api/save-file';
import { formValue } from '../../core/forms/form-value';
import { SetupApi } from './setup-api';

/**
 * Tags printed before their collars exist: each QR code holds a fresh collar id that the crew
 * adopts by scanning the tag on Walk's install screen, so the tag opens that collar from then on.
 * With a code prefix the tags also carry planned codes (N-101, N-102, …) that fill in the code.
 */
@Component({
  selector: 'fw-blank-tags',
  imports: [ReactiveFormsModule, MatButtonModule, MatButtonToggleModule, MatFormFieldModule, MatInputModule],
  template: `
    <section aria-labelledby="blank-tags-heading">
      <h3 id="blank-tags-heading">Tags for new collars</h3>
      <p>Print tags before installing: the crew scans one on the install screen and the new collar takes it.</p>
      <form class="fields" [formGroup]="form" (ngSubmit)="download()">
        <mat-button-toggle-group formControlName="paper" aria-label="Paper size of the blank tags">
          <mat-button-toggle value="a4">A4</mat-button-toggle>
          <mat-button-toggle value="letter">Letter</mat-button-toggle>
        </mat-button-toggle-group>
        <mat-form-field subscriptSizing="dynamic">
          <mat-label>How many tags</mat-label>
          <input matInput inputmode="numeric" data-testid="blank-count" formControlName="count" />
          <mat-hint>21 fit a sheet</mat-hint>
        </mat-form-field>
        <mat-form-field subscriptSizing="dynamic">
          <mat-label>Code prefix (optional)</mat-label>
          <input matInput autocomplete="off" data-testid="blank-prefix" formControlName="prefix" />
        </mat-form-field>
        @if (value().prefix.trim()) {
          <mat-form-field subscriptSizing="dynamic">
            <mat-label>First number</mat-label>
            <input matInput inputmode="numeric" data-testid="blank-first" formControlName="first" />
          </mat-form-field>
          <mat-form-field subscriptSizing="dynamic">
            <mat-label>Digits</mat-label>
            <input matInput inputmode="numeric" formControlName="digits" />
          </mat-form-field>
        }
        <button mat-flat-button type="submit" [disabled]="busy()" data-testid="blank-download">Download blank tags (PDF)</button>
      </form>
      <p data-testid="blank-preview">{{ preview() }}</p>
      @if (problem()) { <p role="alert" class="problem">{{ problem() }}</p> }
      <p role="status">{{ message() }}</p>
    </section>
  `,
  styles: `
    .fields { display: flex; gap: 1rem; align-items: center; flex-wrap: wrap; margin-block: .5rem; }
    .fields mat-form-field { width: 11rem; }
    .problem { color: var(--mat-sys-error); }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class BlankTags {
  private readonly api = inject(SetupApi);
  readonly siteId = input.required<string>();

  /** Numbers stay text as typed: the preview and the server say what is wrong with them. */
  protected readonly form = new FormGroup({
    paper: new FormControl<'a4' | 'letter'>('a4', { nonNullable: true }),
    count: new FormControl('21', { nonNullable: true }),
    prefix: new FormControl('', { nonNullable: true }),
    first: new FormControl('1', { nonNullable: true }),
    digits: new FormControl('2', { nonNullable: true }),
  });
  protected readonly value = formValue(this.form);
  protected readonly busy = signal(false);
  protected readonly problem = signal('');
  protected readonly message = signal('');

  /** The planned codes spelled out, so a lead sees "N-01 … N-21" before printing. */
  protected readonly preview = computed(() => {
    const { count, prefix, first, digits } = this.value();
    const n = Number(count);
    const p = prefix.trim();
    if (!Number.isInteger(n) || n < 1) return '';
    if (!p) return `${n} tag${n === 1 ? '' : 's'} without codes: the crew types each code when installing.`;
    // Only the first and last code: a typed count of a million must not build a million strings.
    const code = (i: number) => plannedTagCodes(p, Number(first) + i, Number(digits) || 1, 1)[0];
    return n === 1 ? `Planned code ${code(0)}.` : `Planned codes ${code(0)} … ${code(n - 1)}.`;
  });

  protected async download(): Promise<void> {
    this.busy.set(true);
    this.problem.set('');
    this.message.set('');
    try {
      const { paper, count, prefix, first, digits } = this.form.getRawValue();
      const sheet = await this.api.blankTags(this.siteId(), {
        paper,
        count: Number(count),
        codePrefix: prefix.trim(),
        firstNumber: Number(first),
        digits: Number(digits),
      });
      saveFile(sheet.pdf, sheet.fileName);
      this.message.set(`${sheet.count} blank tags saved as ${sheet.fileName}.`);
    } catch (err) {
      const fields = fieldProblems(err);
      this.problem.set(fields.length ? fields.map((f) => f.message).join(' · ') : serverMessage(err, 'Could not make the tag sheet'));
    } finally {
      this.busy.set(false);
    }
  }
}

import { httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { FormControl, FormGroup, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { RouterLink } from '@angular/router';
import {
  guessLayout,
  readTemperatureSeries,
  temperatureColumns,
  TIMESTAMP_FORMATS,
  type TextLayout,
  type TimestampFormat,
} from '../../../../shared/logger';
import { serverMessage } from '../../core/api/api-error';
import { SiteChoice } from '../../core/auth/site-choice';
import { SiteTimePipe } from '../../core/time/site-time-pipe';
import { TemperatureLogApi, type LogMode, type PlotChoice, type TemperatureLogOutcome } from './temperature-log-api';

const MAX_BYTES = 900_000;
const TIME_HEADER = /time|date|zeit|datum|stamp/i;

/**
 * Soil-temperature logger file → temperature logs on the server (seasonal totals fill their days
 * from them). The file is read here with the same shared reader the server imports with, so the
 * preview's line errors are the ones the server would refuse; the lab then says which plot(s) the
 * logger stands for, its depth, and whether the file replaces or is appended to logs already stored.
 */
@Component({
  selector: 'fw-temperature-log-import',
  imports: [
    ReactiveFormsModule,
    RouterLink,
    SiteTimePipe,
    MatButtonModule,
    MatButtonToggleModule,
    MatFormFieldModule,
    MatInputModule,
    MatProgressBarModule,
    MatSelectModule,
  ],
  templateUrl: './temperature-log-import.html',
  styleUrl: './temperature-log-import.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class TemperatureLogImport {
  private readonly api = inject(TemperatureLogApi);
  protected readonly site = inject(SiteChoice).current;
  protected readonly zone = computed(() => this.site()?.timezone ?? 'UTC');
  protected readonly formats = TIMESTAMP_FORMATS.filter((f) => f !== 'Unix seconds');
  protected readonly plots = httpResource<{ items: PlotChoice[] }>(() => {
    const s = this.site();
    return s ? `/api/plots?siteId=${s.id}&limit=500` : undefined;
  });
  protected readonly plotChoices = computed(() => (this.plots.hasValue() ? this.plots.value().items : []));

  protected readonly fileName = signal('');
  protected readonly text = signal('');
  protected readonly layout = signal<TextLayout | null>(null);
  protected readonly busy = signal(false);
  protected readonly problem = signal('');
  protected readonly outcome = signal<TemperatureLogOutcome | null>(null);

  protected readonly form = new FormGroup({
    timeColumn: new FormControl('', { nonNullable: true, validators: Validators.required }),
    tempColumn: new FormControl('', { nonNullable: true, validators: Validators.required }),
    timeFormat: new FormControl<TimestampFormat | 'auto'>('auto', { nonNullable: true }),
    depthCm: new FormControl<number | null>(null, { validators: [Validators.required, Validators.min(0), Validators.max(200)] }),
    plotIds: new FormControl<string[]>([], { nonNullable: true, validators: Validators.required }),
    mode: new FormControl<LogMode>('append', { nonNullable: true }),
    source: new FormControl('', { nonNullable: true, validators: Validators.maxLength(255) }),
  });
  private readonly values = toSignal(this.form.valueChanges, { initialValue: this.form.getRawValue() });

  /** What the server would store from this file with this mapping, line errors included. */
  protected readonly preview = computed(() => {
    const text = this.text();
    const v = this.values();
    if (!text || !v.timeColumn || !v.tempColumn) return null;
    return readTemperatureSeries({
      text,
      timeColumn: v.timeColumn,
      tempColumn: v.tempColumn,
      timeZone: this.zone(),
      timeFormat: v.timeFormat === 'auto' ? undefined : v.timeFormat,
    });
  });
  protected readonly canSend = computed(() => {
    const p = this.preview();
    this.values();
    return !!p && !p.missingColumn && p.problems.length === 0 && p.t.length > 0 && this.form.valid && !this.busy();
  });
  protected readonly plotCode = (id: string) => this.plotChoices().find((p) => p.id === id)?.code ?? id;

  protected async chooseFile(input: HTMLInputElement): Promise<void> {
    const f = input.files?.[0];
    input.value = '';
    if (!f) return;
    this.problem.set('');
    this.outcome.set(null);
    if (f.size > MAX_BYTES) {
      this.problem.set(
        `${f.name} has ${(f.size / 1_000_000).toFixed(1)} MB; temperature files are limited to 0.9 MB (split the season into several files)`,
      );
      return;
    }
    await this.useText(f.name, await f.text());
  }

  /** Column guesses: a time-like header for time, the first temperature-like column for temperature. */
  async useText(name: string, text: string): Promise<void> {
    const layout = guessLayout(text);
    this.layout.set(layout);
    this.fileName.set(name);
    const time = layout.headers.find((h) => TIME_HEADER.test(h)) ?? layout.headers[0] ?? '';
    const temps = temperatureColumns(text, layout)
      .map((c) => c.header)
      .filter((h) => h !== time);
    const temp = temps[0] ?? layout.headers.find((h) => h !== time) ?? '';
    this.form.patchValue({ timeColumn: time, tempColumn: temp, source: this.form.controls.source.value || name });
    this.text.set(text);
  }

  protected async send(dryRun: boolean): Promise<void> {
    const s = this.site();
    if (!s || !this.canSend()) return;
    const v = this.form.getRawValue();
    this.busy.set(true);
    this.problem.set('');
    try {
      this.outcome.set(
        await this.api.importLog({
          siteId: s.id,
          plotIds: v.plotIds,
          depthCm: Number(v.depthCm),
          source: v.source,
          text: this.text(),
          timeColumn: v.timeColumn,
          tempColumn: v.tempColumn,
          timeZone: s.timezone,
          timeFormat: v.timeFormat === 'auto' ? undefined : v.timeFormat,
          mode: v.mode,
          dryRun,
        }),
      );
    } catch (err) {
      this.problem.set(serverMessage(err, 'The temperature log was not imported'));
    } finally {
      this.busy.set(false);
    }
  }
}

import { ChangeDetectionStrategy, Component, computed, inject, input, output, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import Papa from 'papaparse';
import { serverMessage } from '../../core/api/api-error';
import { SetupApi, type ImportPreview } from './setup-api';

interface Grid {
  headers: string[];
  rows: string[][];
}

/**
 * Collar import in three steps: choose a file, check it (column mapping and every row's errors,
 * nothing stored), fix the cells the check named right here, then import all rows or none.
 */
@Component({
  selector: 'fw-collar-import',
  imports: [MatButtonModule, MatFormFieldModule, MatInputModule, MatSelectModule],
  templateUrl: './collar-import.html',
  styleUrl: './collar-import.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CollarImport {
  private readonly api = inject(SetupApi);
  readonly siteId = input.required<string>();
  readonly imported = output<number>();

  protected readonly fileName = signal('');
  protected readonly grid = signal<Grid | null>(null);
  protected readonly mapping = signal<Record<string, string>>({});
  protected readonly preview = signal<ImportPreview | null>(null);
  protected readonly message = signal('');
  protected readonly busy = signal(false);
  protected readonly badRows = computed(() => this.preview()?.rows.filter((r) => r.errors.length) ?? []);
  protected readonly targets = computed(() => Object.entries(this.preview()?.targets ?? {}).map(([key, t]) => ({ key, ...t })));
  protected readonly ready = computed(() => {
    const p = this.preview();
    return !!p && p.errorRows === 0 && p.fileErrors.length === 0 && p.validRows > 0;
  });

  protected async chooseFile(input: HTMLInputElement): Promise<void> {
    const file = input.files?.[0];
    if (!file) return;
    this.fileName.set(file.name);
    this.preview.set(null);
    this.mapping.set({});
    // Same parser and options as the server, so row numbers agree.
    const res = Papa.parse<string[]>((await file.text()).replace(/^\uFEFF/, ''), { skipEmptyLines: 'greedy' });
    const [headers = [], ...rows] = res.data;
    this.grid.set({ headers: headers.map((h) => h.trim()), rows });
    await this.check();
  }

  protected csv(): string {
    const g = this.grid();
    return g ? Papa.unparse([g.headers, ...g.rows]) : '';
  }

  protected async check(): Promise<void> {
    this.busy.set(true);
    try {
      const p = await this.api.previewImport(this.siteId(), this.csv(), this.mapping());
      this.preview.set(p);
      this.mapping.set(p.mapping);
      this.message.set(
        p.errorRows || p.fileErrors.length
          ? `${p.errorRows} of ${p.rows.length} rows need a fix${p.fileErrors.length ? `; ${p.fileErrors.length} problem(s) with the file` : ''}. Nothing was stored.`
          : `All ${p.validRows} rows are ready to import.`,
      );
    } catch (err) {
      this.message.set(serverMessage(err, 'The file could not be checked'));
    } finally {
      this.busy.set(false);
    }
  }

  protected mapTo(target: string, header: string): void {
    this.mapping.update((m) => ({ ...m, [target]: header }));
  }

  protected cell(row: number, column: string): string {
    const g = this.grid();
    const j = g?.headers.indexOf(column) ?? -1;
    return j < 0 ? '' : (g!.rows[row - 2]?.[j] ?? '');
  }

  protected editable(column: string): boolean {
    return (this.grid()?.headers.indexOf(column) ?? -1) >= 0;
  }

  protected fixCell(row: number, column: string, value: string): void {
    this.grid.update((g) => {
      if (!g) return g;
      const j = g.headers.indexOf(column);
      const rows = g.rows.map((r, i) => (i === row - 2 ? r.map((c, k) => (k === j ? value : c)) : r));
      return { ...g, rows };
    });
  }

  protected async commit(): Promise<void> {
    this.busy.set(true);
    try {
      const res = await this.api.commitImport(this.siteId(), this.csv(), this.mapping());
      this.message.set(`Imported ${res.created} collars.`);
      this.preview.set(null);
      this.grid.set(null);
      this.imported.emit(res.created);
    } catch (err) {
      this.message.set(serverMessage(err, 'Nothing was imported'));
      await this.check();
    } finally {
      this.busy.set(false);
    }
  }
}

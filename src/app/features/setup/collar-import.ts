import { ChangeDetectionStrategy, Component, computed, inject, input, output, signal } from '@angular/core';
import { FormControl, FormRecord, ReactiveFormsModule } from '@angular/forms';
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

/** A cell the check named, as a field to fix it in: it starts with the file's value. */
interface CellFix {
  row: number;
  column: string;
  control: FormControl<string>;
}

const cellKey = (row: number, column: string) => JSON.stringify([row, column]);

/**
 * Collar import in three steps: choose a file, check it (column mapping and every row's errors,
 * nothing stored), fix the cells the check named right here, then import all rows or none.
 */
@Component({
  selector: 'fw-collar-import',
  imports: [ReactiveFormsModule, MatButtonModule, MatFormFieldModule, MatInputModule, MatSelectModule],
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
  /**
   * Which header each import field reads ('' = not in the file), starting from what the last check resolved. A field
   * the check left out is sent only once the person sets it: left out, the server guesses it from the headers.
   */
  protected readonly columns = signal(new FormRecord<FormControl<string>>({}));
  protected readonly preview = signal<ImportPreview | null>(null);
  /** The named cells' fields, by row and column; what is typed goes into the file sent with the next check or the import. */
  private readonly fixes = signal<Map<string, CellFix>>(new Map());
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
    this.fixes.set(new Map());
    this.columns.set(new FormRecord({}));
    // Same parser and options as the server, so row numbers agree.
    const res = Papa.parse<string[]>((await file.text()).replace(/^\uFEFF/, ''), { skipEmptyLines: 'greedy' });
    const [headers = [], ...rows] = res.data;
    this.grid.set({ headers: headers.map((h) => h.trim()), rows });
    await this.check();
  }

  /** The file as it will be sent: the chosen file with the fixes typed so far. */
  protected csv(): string {
    const g = this.fixedGrid();
    return g ? Papa.unparse([g.headers, ...g.rows]) : '';
  }

  private fixedGrid(): Grid | null {
    const g = this.grid();
    if (!g) return null;
    const rows = g.rows.map((r) => [...r]);
    for (const f of this.fixes().values()) {
      const [j, cells] = [g.headers.indexOf(f.column), rows[f.row - 2]];
      if (j >= 0 && cells) cells[j] = f.control.value;
    }
    return { ...g, rows };
  }

  /** A field for each cell the check named that is in the file (a missing column cannot be fixed here). */
  private fixesFor(p: ImportPreview, g: Grid | null): Map<string, CellFix> {
    const out = new Map<string, CellFix>();
    for (const r of p.rows)
      for (const e of r.errors) {
        const j = g?.headers.indexOf(e.column) ?? -1;
        if (j < 0) continue;
        const control = new FormControl(g!.rows[r.row - 2]?.[j] ?? '', { nonNullable: true });
        out.set(cellKey(r.row, e.column), { row: r.row, column: e.column, control });
      }
    return out;
  }

  protected async check(): Promise<void> {
    this.busy.set(true);
    try {
      const grid = this.fixedGrid();
      const p = await this.api.previewImport(this.siteId(), this.csv(), this.mapping());
      this.grid.set(grid);
      this.fixes.set(this.fixesFor(p, grid));
      this.preview.set(p);
      this.columns.set(
        new FormRecord(
          Object.fromEntries(Object.keys(p.targets).map((t) => [t, new FormControl(p.mapping[t] ?? '', { nonNullable: true })])),
        ),
      );
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

  /** The mapping sent: what the last check resolved, and every field the person set. */
  private mapping(): Record<string, string> {
    const resolved = this.preview()?.mapping ?? {};
    return Object.fromEntries(
      Object.entries(this.columns().controls).flatMap(([target, c]) => (target in resolved || c.dirty ? [[target, c.value]] : [])),
    );
  }

  protected column(target: string): FormControl<string> {
    return this.columns().controls[target]!;
  }

  protected fix(row: number, column: string): CellFix | undefined {
    return this.fixes().get(cellKey(row, column));
  }

  protected async commit(): Promise<void> {
    this.busy.set(true);
    try {
      const res = await this.api.commitImport(this.siteId(), this.csv(), this.mapping());
      this.message.set(`Imported ${res.created} collars.`);
      this.preview.set(null);
      this.grid.set(null);
      this.fixes.set(new Map());
      this.imported.emit(res.created);
    } catch (err) {
      this.message.set(serverMessage(err, 'Nothing was imported'));
      await this.check();
    } finally {
      this.busy.set(false);
    }
  }
}

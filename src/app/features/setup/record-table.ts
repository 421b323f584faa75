import { ChangeDetectionStrategy, Component, computed, effect, inject, input, signal, viewChild } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatPaginator, MatPaginatorModule } from '@angular/material/paginator';
import { MatSelectModule } from '@angular/material/select';
import { MatSort, MatSortModule } from '@angular/material/sort';
import { MatTableDataSource, MatTableModule } from '@angular/material/table';
import { ENTITY_FIELDS, ENTITY_PATHS, type EntityName } from '../../../../shared/model/entities';
import { fieldProblems, serverMessage } from '../../core/api/api-error';
import { SetupApi, type Rec } from './setup-api';
import { issuesByField, toFields, type ColumnDef } from './record-fields';

/**
 * A site's records of one kind as a Material table (sort, filter, pages) with inline edit, an
 * add row and delete. Every save is checked first with the shared zod schema of the record, so
 * the messages match the server's; the server's answer (403, 409, 400) is shown as it comes.
 */
@Component({
  selector: 'fw-record-table',
  imports: [
    MatTableModule,
    MatSortModule,
    MatPaginatorModule,
    MatFormFieldModule,
    MatInputModule,
    MatSelectModule,
    MatButtonModule,
    MatIconModule,
  ],
  templateUrl: './record-table.html',
  styleUrl: './record-table.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class RecordTable {
  private readonly api = inject(SetupApi);
  readonly entity = input.required<EntityName>();
  readonly title = input.required<string>();
  readonly siteId = input.required<string>();
  readonly columns = input.required<ColumnDef[]>();
  readonly defaults = input<Record<string, unknown>>({});

  protected readonly rows = signal<Rec[]>([]);
  protected readonly editingId = signal<string | null>(null);
  protected readonly draft = signal<Partial<Record<string, string>>>({});
  protected readonly addDraft = signal<Partial<Record<string, string>>>({});
  protected readonly errors = signal<Partial<Record<string, string>>>({});
  protected readonly addErrors = signal<Partial<Record<string, string>>>({});
  protected readonly message = signal('');
  protected readonly data = new MatTableDataSource<Rec>([]);
  protected readonly displayed = computed(() => [...this.columns().map((c) => c.key), 'actions']);
  private readonly sort = viewChild(MatSort);
  private readonly paginator = viewChild(MatPaginator);

  constructor() {
    effect(() => {
      const siteId = this.siteId();
      void this.load(siteId);
    });
    effect(() => {
      this.data.data = this.rows();
      this.data.sort = this.sort() ?? null;
      this.data.paginator = this.paginator() ?? null;
    });
    this.data.filterPredicate = (r, f) => this.columns().some((c) => this.display(r, c).toLowerCase().includes(f));
    this.data.sortingDataAccessor = (r, key) => {
      const c = this.columns().find((x) => x.key === key);
      return c?.kind === 'number' ? Number(r[key] ?? -Infinity) : c ? this.display(r, c).toLowerCase() : '';
    };
  }

  private get path(): string {
    return ENTITY_PATHS[this.entity()];
  }

  async load(siteId: string): Promise<void> {
    try {
      this.rows.set(await this.api.list(this.path, { siteId }));
    } catch (err) {
      this.message.set(serverMessage(err, `Could not load ${this.title().toLowerCase()}`));
    }
  }

  protected display(r: Rec, c: ColumnDef): string {
    const v = r[c.key];
    if (c.kind === 'select') return c.options().find((o) => o.value === v)?.label ?? '';
    return v === null || v === undefined ? '' : String(v);
  }

  protected applyFilter(value: string): void {
    this.data.filter = value.trim().toLowerCase();
  }

  protected startEdit(r: Rec): void {
    this.editingId.set(r.id);
    this.errors.set({});
    this.draft.set(
      Object.fromEntries(this.columns().map((c) => [c.key, r[c.key] === null || r[c.key] === undefined ? '' : String(r[c.key])])),
    );
  }

  protected setDraft(which: 'edit' | 'add', key: string, value: string): void {
    (which === 'edit' ? this.draft : this.addDraft).update((d) => ({ ...d, [key]: value }));
  }

  protected async saveEdit(r: Rec): Promise<void> {
    const fields = toFields(this.columns(), this.draft());
    const check = ENTITY_FIELDS[this.entity()].safeParse({ ...r, ...fields });
    if (!check.success) return this.errors.set(issuesByField(check.error.issues));
    try {
      const saved = await this.api.update(this.path, r.id, r.rev, fields);
      this.rows.update((rows) => rows.map((x) => (x.id === r.id ? saved : x)));
      this.editingId.set(null);
      this.message.set(`Saved ${this.display(saved, this.columns()[0]!)}`);
    } catch (err) {
      this.errors.set(Object.fromEntries(fieldProblems(err).map((p) => [p.path, p.message])));
      this.message.set(serverMessage(err, 'Not saved'));
    }
  }

  protected async add(): Promise<void> {
    const fields = { ...this.defaults(), siteId: this.siteId(), ...toFields(this.columns(), this.addDraft()) };
    const check = ENTITY_FIELDS[this.entity()].safeParse(fields);
    if (!check.success) return this.addErrors.set(issuesByField(check.error.issues));
    try {
      const saved = await this.api.create(this.path, fields);
      this.rows.update((rows) => [...rows, saved]);
      this.addDraft.set({});
      this.addErrors.set({});
      this.message.set(`Added ${this.display(saved, this.columns()[0]!)}`);
    } catch (err) {
      this.addErrors.set(Object.fromEntries(fieldProblems(err).map((p) => [p.path, p.message])));
      this.message.set(serverMessage(err, 'Not added'));
    }
  }

  protected async remove(r: Rec): Promise<void> {
    try {
      await this.api.remove(this.path, r.id, r.rev);
      this.rows.update((rows) => rows.filter((x) => x.id !== r.id));
      this.message.set(`Deleted ${this.display(r, this.columns()[0]!)}`);
    } catch (err) {
      this.message.set(serverMessage(err, 'Not deleted'));
    }
  }
}

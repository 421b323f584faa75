import { ChangeDetectionStrategy, Component, computed, effect, inject, input, resource, signal, viewChild } from '@angular/core';
import { takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { FormControl, FormRecord, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatPaginator, MatPaginatorModule } from '@angular/material/paginator';
import { MatSelectModule } from '@angular/material/select';
import { MatSort, MatSortModule } from '@angular/material/sort';
import { MatTableDataSource, MatTableModule } from '@angular/material/table';
import { ENTITY_FIELDS, type EntityName } from '../../../../shared/model/entities';
import type { StoredRecord } from '../../../../shared/model/stored-record';
import { fieldProblems, serverMessage } from '../../core/api/api-error';
import { issuesByField, toFields, type ColumnDef } from './record-fields';
import { SetupApi, type RecordInput } from './setup-api';

/** A record of the table's entity, which is named at run time: its columns read fields through `fieldOf`. */
type Row = StoredRecord<EntityName>;
/** One text per column; a select's '' is "none". */
type Draft = FormRecord<FormControl<string>>;

/** A field named by a column (known only at run time): the one place this table reads a record by a key. */
function fieldOf(r: Row, key: string): unknown {
  const value: unknown = Reflect.get(r, key);
  return value;
}

function draftOf(columns: ColumnDef[]): Draft {
  return new FormRecord(Object.fromEntries(columns.map((c) => [c.key, new FormControl('', { nonNullable: true })])));
}

/** The draft's texts by column; `only` picks the controls to include (a field left out takes the schema's default). */
function textsOf(draft: Draft, only: (c: FormControl<string>) => boolean = () => true): Partial<Record<string, string>> {
  return Object.fromEntries(Object.entries(draft.controls).flatMap(([key, c]) => (only(c) ? [[key, c.value]] : [])));
}

/**
 * A site's records of one kind as a Material table (sort, filter, pages) with inline edit, an
 * add row and delete. Every save is checked first with the shared zod schema of the record, so
 * the messages match the server's; the server's answer (403, 409, 400) is shown as it comes.
 */
@Component({
  selector: 'fw-record-table',
  imports: [
    ReactiveFormsModule,
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

  private readonly list = resource({
    params: () => ({ entity: this.entity(), siteId: this.siteId() }),
    loader: ({ params: { entity, siteId } }): Promise<Row[]> => this.api.list(entity, { siteId }),
  });
  protected readonly rows = computed(() => (this.list.hasValue() ? this.list.value() : []));
  protected readonly editingId = signal<string | null>(null);
  /** The row being edited, and the add row; both rebuilt when the columns change. */
  protected readonly draft = computed(() => draftOf(this.columns()));
  protected readonly addDraft = computed(() => draftOf(this.columns()));
  protected readonly filter = new FormControl('', { nonNullable: true });
  protected readonly errors = signal<Partial<Record<string, string>>>({});
  protected readonly addErrors = signal<Partial<Record<string, string>>>({});
  private readonly saveMessage = signal('');
  private readonly loadMessage = computed(() => {
    const err = this.list.error();
    return err ? serverMessage(err, `Could not load ${this.title().toLowerCase()}`) : '';
  });
  protected readonly message = computed(() => this.loadMessage() || this.saveMessage());
  protected readonly data = new MatTableDataSource<Row>([]);
  protected readonly displayed = computed(() => [...this.columns().map((c) => c.key), 'actions']);
  private readonly sort = viewChild(MatSort);
  private readonly paginator = viewChild(MatPaginator);

  constructor() {
    // Hands the rows, sort and pages to Material's table source (not a signal API).
    effect(() => {
      this.data.data = this.rows();
      this.data.sort = this.sort() ?? null;
      this.data.paginator = this.paginator() ?? null;
    });
    this.filter.valueChanges.pipe(takeUntilDestroyed()).subscribe((f) => (this.data.filter = f.trim().toLowerCase()));
    this.data.filterPredicate = (r, f) => this.columns().some((c) => this.display(r, c).toLowerCase().includes(f));
    this.data.sortingDataAccessor = (r, key) => {
      const c = this.columns().find((x) => x.key === key);
      return c?.kind === 'number' ? Number(fieldOf(r, key) ?? -Infinity) : c ? this.display(r, c).toLowerCase() : '';
    };
  }

  protected display(r: Row, c: ColumnDef): string {
    const v = fieldOf(r, c.key);
    if (c.kind === 'select') return c.options().find((o) => o.value === v)?.label ?? '';
    return v === null || v === undefined ? '' : String(v);
  }

  protected control(draft: Draft, key: string): FormControl<string> {
    return draft.controls[key]!;
  }

  protected startEdit(r: Row): void {
    this.editingId.set(r.id);
    this.errors.set({});
    this.draft().reset(
      Object.fromEntries(
        this.columns().map((c) => {
          const v = fieldOf(r, c.key);
          return [c.key, v === null || v === undefined ? '' : String(v)];
        }),
      ),
    );
  }

  protected async saveEdit(r: Row): Promise<void> {
    const fields = toFields(this.columns(), textsOf(this.draft()));
    const check = ENTITY_FIELDS[this.entity()].safeParse({ ...r, ...fields });
    if (!check.success) return this.errors.set(issuesByField(check.error.issues));
    try {
      const saved = await this.api.update(this.entity(), r.id, r.rev, checkedInput(fields));
      this.list.update((rows) => rows?.map((x) => (x.id === r.id ? saved : x)));
      this.editingId.set(null);
      this.saveMessage.set(`Saved ${this.display(saved, this.columns()[0]!)}`);
    } catch (err) {
      this.errors.set(Object.fromEntries(fieldProblems(err).map((p) => [p.path, p.message])));
      this.saveMessage.set(serverMessage(err, 'Not saved'));
    }
  }

  protected async add(): Promise<void> {
    // Only the fields the person filled in: the others take the defaults given to the table, then the schema's.
    const typed = textsOf(this.addDraft(), (c) => c.dirty);
    const fields = { ...this.defaults(), siteId: this.siteId(), ...toFields(this.columns(), typed) };
    const check = ENTITY_FIELDS[this.entity()].safeParse(fields);
    if (!check.success) return this.addErrors.set(issuesByField(check.error.issues));
    try {
      const saved = await this.api.create(this.entity(), checkedInput(fields));
      this.list.update((rows) => [...(rows ?? []), saved]);
      this.addDraft().reset();
      this.addErrors.set({});
      this.saveMessage.set(`Added ${this.display(saved, this.columns()[0]!)}`);
    } catch (err) {
      this.addErrors.set(Object.fromEntries(fieldProblems(err).map((p) => [p.path, p.message])));
      this.saveMessage.set(serverMessage(err, 'Not added'));
    }
  }

  protected async remove(r: Row): Promise<void> {
    try {
      await this.api.remove(this.entity(), r.id, r.rev);
      this.list.update((rows) => rows?.filter((x) => x.id !== r.id));
      this.saveMessage.set(`Deleted ${this.display(r, this.columns()[0]!)}`);
    } catch (err) {
      this.saveMessage.set(serverMessage(err, 'Not deleted'));
    }
  }
}

/** Fields the entity's own schema has just accepted: the boundary where columns named at run time meet the typed API. */
function checkedInput(fields: Record<string, unknown>): RecordInput<EntityName> {
  return fields as RecordInput<EntityName>;
}

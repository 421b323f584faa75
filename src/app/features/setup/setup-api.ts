import { HttpClient, HttpErrorResponse } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { firstValueFrom } from 'rxjs';
import { ENTITY_PATHS, type EntityFields, type EntityName } from '../../../../shared/model/entities';
import type { StoredRecord } from '../../../../shared/model/stored-record';
import { RecordsApi } from '../../core/api/records-api';

/** Fields sent to create or edit a record of E: the shared schema's, any subset (the server fills defaults and checks the whole). */
export type RecordInput<E extends EntityName> = Partial<EntityFields<E>>;

export interface ImportCellError {
  row: number;
  column: string;
  message: string;
}

export interface ImportPreview {
  headers: string[];
  mapping: Record<string, string>;
  targets: Record<string, { label: string; unit: string | null; required: boolean }>;
  rows: { row: number; cells: Record<string, string>; errors: ImportCellError[] }[];
  fileErrors: ImportCellError[];
  validRows: number;
  errorRows: number;
}

export interface UserRow {
  id: string;
  email: string;
  displayName: string;
  roles: string[];
  siteIds: string[];
  disabled?: boolean;
}

/** Setup's calls: the generic record routes plus import, tags, profile versions and users. */
@Injectable({ providedIn: 'root' })
export class SetupApi {
  private readonly http = inject(HttpClient);
  private readonly records = inject(RecordsApi);

  /** Every record of an entity matching the query (the shared paging loop of RecordsApi). */
  list<E extends EntityName>(entity: E, query: Record<string, string> = {}): Promise<StoredRecord<E>[]> {
    return this.records.list(entity, query);
  }

  async create<E extends EntityName>(entity: E, fields: RecordInput<E>): Promise<StoredRecord<E>> {
    return (await firstValueFrom(this.http.post<{ record: StoredRecord<E> }>(`/api/${ENTITY_PATHS[entity]}`, fields))).record;
  }

  async update<E extends EntityName>(entity: E, id: string, rev: number, fields: RecordInput<E>): Promise<StoredRecord<E>> {
    return (await firstValueFrom(this.http.patch<{ record: StoredRecord<E> }>(`/api/${ENTITY_PATHS[entity]}/${id}`, { rev, ...fields })))
      .record;
  }

  async remove(entity: EntityName, id: string, rev: number): Promise<void> {
    await firstValueFrom(this.http.delete(`/api/${ENTITY_PATHS[entity]}/${id}`, { params: { rev: String(rev) } }));
  }

  previewImport(siteId: string, csv: string, mapping: Record<string, string>): Promise<ImportPreview> {
    return firstValueFrom(this.http.post<ImportPreview>(`/api/sites/${siteId}/collar-import/preview`, { csv, mapping }));
  }

  commitImport(siteId: string, csv: string, mapping: Record<string, string>): Promise<{ created: number }> {
    return firstValueFrom(this.http.post<{ created: number }>(`/api/sites/${siteId}/collar-import/commit`, { csv, mapping }));
  }

  /** One plot's tags only when plotId is given: large sites print a plot at a time. */
  tagSheetUrl(siteId: string, paper: 'a4' | 'letter', plotId: string | null = null): string {
    return `/api/sites/${siteId}/collar-tags.pdf?paper=${paper}${plotId ? `&plotId=${encodeURIComponent(plotId)}` : ''}`;
  }

  /**
   * A sheet of blank tags for collars not installed yet. Fetched (not a plain link) so that a
   * refusal, e.g. planned codes already in use, is shown instead of being saved as the "PDF".
   */
  async blankTags(siteId: string, options: BlankTagOptions): Promise<{ pdf: Blob; fileName: string; count: number }> {
    const planned: Record<string, string> = options.codePrefix
      ? { codePrefix: options.codePrefix, firstNumber: String(options.firstNumber), digits: String(options.digits) }
      : {};
    const params: Record<string, string> = { paper: options.paper, count: String(options.count), ...planned };
    try {
      const res = await firstValueFrom(
        this.http.get(`/api/sites/${siteId}/blank-collar-tags.pdf`, { params, responseType: 'blob', observe: 'response' }),
      );
      const fileName = /filename="([^"]+)"/.exec(res.headers.get('Content-Disposition') ?? '')?.[1] ?? 'new-collar-tags.pdf';
      return { pdf: res.body!, fileName, count: Number(res.headers.get('X-Tag-Count')) };
    } catch (err) {
      throw await withJsonError(err);
    }
  }

  profileUsage(id: string): Promise<{ closures: number }> {
    return firstValueFrom(this.http.get<{ closures: number }>(`/api/chamber-profiles/${id}/usage`));
  }

  recomputePreview(siteId: string, validFrom: string): Promise<{ closures: number; lockedKept: number; until: string | null }> {
    return firstValueFrom(
      this.http.post<{ closures: number; lockedKept: number; until: string | null }>(
        `/api/sites/${siteId}/chamber-profiles/recompute-preview`,
        { validFrom },
      ),
    );
  }

  addProfileVersion(
    id: string,
    fields: RecordInput<'chamberProfile'>,
  ): Promise<{ record: StoredRecord<'chamberProfile'>; recomputed: number; lockedKept: number }> {
    return firstValueFrom(
      this.http.post<{ record: StoredRecord<'chamberProfile'>; recomputed: number; lockedKept: number }>(
        `/api/chamber-profiles/${id}/versions`,
        fields,
      ),
    );
  }

  async users(): Promise<UserRow[]> {
    return (await firstValueFrom(this.http.get<{ items: UserRow[] }>('/api/users'))).items;
  }

  async updateUser(id: string, changes: Partial<Pick<UserRow, 'roles' | 'siteIds' | 'disabled' | 'displayName'>>): Promise<UserRow> {
    return (await firstValueFrom(this.http.patch<{ user: UserRow }>(`/api/users/${id}`, changes))).user;
  }
}

export interface BlankTagOptions {
  paper: 'a4' | 'letter';
  count: number;
  /** Empty: the tags carry no planned code and the crew types it when installing. */
  codePrefix: string;
  firstNumber: number;
  digits: number;
}

/** A blob request's error body is a Blob: read it as the server's JSON so messages show as usual. */
async function withJsonError(err: unknown): Promise<unknown> {
  if (!(err instanceof HttpErrorResponse) || !(err.error instanceof Blob)) return err;
  try {
    const body = JSON.parse(await err.error.text());
    return new HttpErrorResponse({
      error: body,
      headers: err.headers,
      status: err.status,
      statusText: err.statusText,
      url: err.url ?? undefined,
    });
  } catch {
    return err;
  }
}

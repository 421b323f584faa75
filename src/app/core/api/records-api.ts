import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { firstValueFrom } from 'rxjs';
import { ENTITY_PATHS, type EntityName } from '../../../../shared/model/entities';
import type { StoredRecord } from '../../../../shared/model/stored-record';

/** The server's cap on one page of a record list. */
const PAGE = 1000;

/** The generic record routes, typed by entity: every screen that lists records online reads them here. */
@Injectable({ providedIn: 'root' })
export class RecordsApi {
  private readonly http = inject(HttpClient);

  /** Every record of an entity matching the query, page after page until the total is reached (a site may hold thousands of collars). */
  list<E extends EntityName>(entity: E, query: Record<string, string> = {}): Promise<StoredRecord<E>[]> {
    return this.listAt<StoredRecord<E>>(ENTITY_PATHS[entity], query);
  }

  /** The one paging loop over a list route (`/api/<path>` answering `{items, total}`). */
  async listAt<T>(path: string, query: Record<string, string> = {}): Promise<T[]> {
    const items: T[] = [];
    for (let offset = 0; ; offset += PAGE) {
      const res = await firstValueFrom(
        this.http.get<{ items: T[]; total: number }>(`/api/${path}`, {
          params: { ...query, limit: String(PAGE), offset: String(offset) },
        }),
      );
      items.push(...res.items);
      if (items.length >= res.total || !res.items.length) return items;
    }
  }

  async record<E extends EntityName>(entity: E, id: string): Promise<StoredRecord<E>> {
    return (await firstValueFrom(this.http.get<{ record: StoredRecord<E> }>(`/api/${ENTITY_PATHS[entity]}/${id}`))).record;
  }
}

import { Column, Entity } from 'typeorm';
import { SyncedColumns } from '../records/synced-columns';

/** A collar's history: installed, clipped, reseated, replaced, damaged, retired. */
@Entity({ name: 'collar_event' })
export class CollarEventEntity extends SyncedColumns {
  @Column({ type: 'uuid', name: 'site_id' })
  siteId!: string;

  @Column({ type: 'uuid', name: 'collar_id' }) collarId!: string;
  @Column({ type: 'text', name: 'kind' }) kind!: string;
  @Column({ type: 'date', name: 'date' }) date!: string;
  @Column({ type: 'text', name: 'note', default: '' }) note!: string;
  @Column({ type: 'uuid', name: 'replaced_by_id', nullable: true }) replacedById!: string | null;
}

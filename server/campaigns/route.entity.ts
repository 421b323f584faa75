import { Column, Entity } from 'typeorm';
import { SyncedColumns } from '../records/synced-columns';

/** An ordered list of collars a crew walks. */
@Entity({ name: 'route' })
export class RouteEntity extends SyncedColumns {
  @Column({ type: 'uuid', name: 'site_id' })
  siteId!: string;

  @Column({ type: 'text', name: 'name' }) name!: string;
  @Column({ type: 'uuid', name: 'collar_ids', array: true, default: () => "'{}'" }) collarIds!: string[];
}

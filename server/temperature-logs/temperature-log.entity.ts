import { Column, Entity } from 'typeorm';
import { SyncedColumns } from '../records/synced-columns';

/** A continuous soil temperature series for one plot and depth (gap filling of seasonal totals). */
@Entity({ name: 'temperature_log' })
export class TemperatureLogEntity extends SyncedColumns {
  @Column({ type: 'uuid', name: 'site_id' })
  siteId!: string;

  @Column({ type: 'uuid', name: 'plot_id' }) plotId!: string;
  @Column({ type: 'double precision', name: 'depth_cm' }) depthCm!: number;
  @Column({ type: 'text', name: 'source', default: '' }) source!: string;
  @Column({ type: 'jsonb', name: 'series' }) series!: { t: string[]; tempC: number[] };
}

import { Column, PrimaryColumn } from 'typeorm';
import { bigintAsNumber } from '../core/bigint-column';

/**
 * Columns every record a device can touch carries: a client-made UUID, the server's revision,
 * who changed it last and when, and a tombstone flag (nothing is hard-deleted).
 */
export abstract class SyncedColumns {
  @PrimaryColumn({ type: 'uuid', name: 'id' })
  id!: string;

  @Column({ type: 'bigint', name: 'rev', default: 1, transformer: bigintAsNumber })
  rev!: number;

  @Column({ type: 'timestamptz', name: 'updated_at', default: () => 'now()' })
  updatedAt!: Date;

  @Column({ type: 'uuid', name: 'updated_by', nullable: true })
  updatedBy!: string | null;

  @Column({ type: 'boolean', name: 'deleted', default: false })
  deleted!: boolean;
}

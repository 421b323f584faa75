import { ChangeDetectionStrategy, Component, computed, input, output, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { atProbeDepth, probeSummary, type SampleStats } from '../../../../shared/model/probe-replicates';
import { SiteTimePipe } from '../../core/time/site-time-pipe';

const one = (v: number) => (Math.round(v * 10) / 10).toFixed(1);

/** One replicate as the list shows it (the probe form builds these from the visit's records). */
export interface ReplicateRow {
  id: string;
  takenAt: string;
  /** "you", or "another member" when someone else took it. */
  takenBy: string;
  soilTemps: readonly { depthCm: number; tempC: number }[];
  vwcPct: number | null;
  moistureText: string;
}

/**
 * A visit's probe replicates: each with its time (site zone), values and who took it; mean, sample
 * SD and n of moisture and of the temperatures at the site's probe depth; temperatures further
 * than the site's tolerance from that depth are named and kept out of the mean. A replicate is deleted
 * after a second tap on "Delete" (a tombstone once synced).
 */
@Component({
  selector: 'fw-probe-replicate-list',
  imports: [MatButtonModule, SiteTimePipe],
  templateUrl: './probe-replicate-list.html',
  styles: `
    .stats {
      margin: 0 0 8px;
      font-weight: 600;
    }
    ol {
      list-style: none;
      margin: 0 0 8px;
      padding: 0;
    }
    li {
      display: flex;
      flex-wrap: wrap;
      align-items: center;
      justify-content: space-between;
      gap: 4px 8px;
      padding: 4px 0;
      border-bottom: 1px solid var(--mat-sys-outline-variant);
    }
    li span {
      min-width: 0;
      overflow-wrap: anywhere;
    }
    .off {
      font-weight: 600;
      color: var(--mat-sys-error);
    }
    .warning {
      border: 2px solid var(--mat-sys-error);
      padding: 8px 12px;
      border-radius: 8px;
      font-weight: 600;
    }
    .actions {
      display: flex;
      flex-wrap: wrap;
      gap: 8px;
    }
    button {
      min-height: 48px;
      min-width: 48px;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ProbeReplicateList {
  readonly rows = input.required<readonly ReplicateRow[]>();
  readonly probeDepthCm = input.required<number>();
  /** The site's depth tolerance, cm (site setting tempDepthToleranceCm). */
  readonly depthToleranceCm = input.required<number>();
  readonly zone = input('UTC');
  readonly removeReplicate = output<string>();

  protected readonly confirming = signal<string | null>(null);
  protected readonly summary = computed(() => probeSummary(this.rows(), this.probeDepthCm(), this.depthToleranceCm()));
  /** "3 replicates · VWC mean 24.2 %, SD 0.9 (n = 3) · soil 11.6 °C at 5 cm, SD 0.1 (n = 2)". */
  protected readonly statsText = computed(() => {
    const s = this.summary();
    const n = this.rows().length;
    const part = (label: string, st: SampleStats, unit: string) =>
      st.mean === null ? '' : ` · ${label} ${one(st.mean)}${unit}${st.sd === null ? '' : `, SD ${one(st.sd)}`} (n = ${st.n})`;
    return `${n} ${n === 1 ? 'replicate' : 'replicates'}${part('VWC mean', s.vwc, ' %')}${part('soil', s.soilTemp, ` °C at ${this.probeDepthCm()} cm`)}`;
  });

  protected offDepth(depthCm: number): boolean {
    return !atProbeDepth(depthCm, this.probeDepthCm(), this.depthToleranceCm());
  }

  protected askDelete(id: string): void {
    this.confirming.set(id);
  }

  protected confirmDelete(id: string): void {
    this.confirming.set(null);
    this.removeReplicate.emit(id);
  }
}

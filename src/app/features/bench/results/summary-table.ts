import { DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import type { Summary } from './results-api';

/** Treatment cell means ± SE over plots per campaign, n at each level, temperature and moisture alongside. */
@Component({
  selector: 'fw-summary-table',
  imports: [DecimalPipe],
  template: `
    <p class="counts">{{ data().counts.closures }} closures · {{ data().counts.visits }} visits · {{ data().counts.collars }} collars ·
      {{ data().counts.plots }} plots. n is the number of plots (the replicates); SE over plots; SE<sub>block</sub> from the least-squares cell + block model (collar-level treatments: cell + plot, since their collars share each plot).</p>
    <div class="fw-table-box" tabindex="0" role="region" aria-label="Treatment means, scrolls sideways"><table data-testid="summary-table">
      <caption>Treatment means (µmol CO₂ m⁻² s⁻¹)</caption>
      <thead><tr><th scope="col">Campaign</th><th scope="col">Treatment</th><th scope="col">Mean</th><th scope="col">± SE</th>
        <th scope="col">SE<sub>block</sub></th><th scope="col">n plots</th><th scope="col">collars</th><th scope="col">visits</th>
        <th scope="col">closures</th><th scope="col">Soil °C</th><th scope="col">VWC %</th></tr></thead>
      <tbody>
        @for (r of rows(); track r.key) {
          <tr><td>{{ r.campaign }}</td><td>{{ r.label }}</td><td>{{ r.m.meanUmolM2S | number: '1.2-2' }}</td>
            <td>{{ r.m.seUmolM2S === null ? '—' : (r.m.seUmolM2S | number: '1.2-2') }}</td>
            <td>{{ r.m.seBlockUmolM2S === null ? '—' : (r.m.seBlockUmolM2S | number: '1.2-2') }}</td>
            <td>{{ r.m.nPlots }}</td><td>{{ r.m.nCollars }}</td><td>{{ r.m.nVisits }}</td><td>{{ r.m.nClosures }}</td>
            <td>{{ r.m.soilTempC === null ? '—' : (r.m.soilTempC | number: '1.1-1') }}</td>
            <td>{{ r.m.vwcPct === null ? '—' : (r.m.vwcPct | number: '1.1-1') }}</td></tr>
        } @empty { <tr><td colspan="11">No selected closures yet.</td></tr> }
      </tbody>
    </table></div>`,
  styles: [
    `table { border-collapse: collapse; width: 100%; font-variant-numeric: tabular-nums; }
    th, td { padding: 2px 8px; text-align: right; border-bottom: 1px solid #ddd; } th:nth-child(-n+2), td:nth-child(-n+2) { text-align: left; }
    caption { text-align: left; font-weight: 600; padding: 4px 0; }`,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SummaryTable {
  readonly data = input.required<Summary>();
  protected readonly rows = computed(() => {
    const d = this.data();
    const names = new Map(d.campaigns.map((c) => [c.campaignId, c.name]));
    const labels = new Map(d.cells.map((c) => [c.key, c.label]));
    return d.cellMeans.map((m) => ({
      key: `${m.campaignId}|${m.cellKey}`,
      campaign: names.get(m.campaignId) ?? '',
      label: labels.get(m.cellKey) ?? m.cellKey,
      m,
    }));
  });
}

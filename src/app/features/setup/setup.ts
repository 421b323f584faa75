import { ChangeDetectionStrategy, Component, computed, effect, inject, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatSelectModule } from '@angular/material/select';
import { MatTabsModule } from '@angular/material/tabs';
import { AuthStore } from '../../core/auth/auth-store';
import { SiteChoice } from '../../core/auth/site-choice';
import { serverMessage } from '../../core/api/api-error';
import { BlankTags } from './blank-tags';
import { AnalyzerChecks } from './analyzer-checks';
import { CollarImport } from './collar-import';
import { CollarList } from './collar-list';
import { Members } from './members';
import { OutlineEditor } from './outline-editor';
import { ProfileVersion } from './profile-version';
import type { ColumnDef } from './record-fields';
import { RecordTable } from './record-table';
import { RouteEditor } from './route-editor';
import { SetupApi, type Rec } from './setup-api';
import { SiteForm } from './site-form';

/** Sites, their layout, people, equipment, routes and collars — for admins (all) and leads (routes, collars, tags). */
@Component({
  selector: 'fw-setup',
  imports: [
    BlankTags,
    MatTabsModule,
    MatFormFieldModule,
    MatSelectModule,
    MatButtonModule,
    SiteForm,
    RecordTable,
    Members,
    ProfileVersion,
    CollarImport,
    CollarList,
    RouteEditor,
    OutlineEditor,
    AnalyzerChecks,
  ],
  templateUrl: './setup.html',
  styleUrl: './setup.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Setup {
  private readonly api = inject(SetupApi);
  private readonly auth = inject(AuthStore);
  private readonly choice = inject(SiteChoice);

  protected readonly isAdmin = computed(() => this.auth.roles().includes('admin'));
  protected readonly sites = signal<Rec[]>([]);
  protected readonly siteId = signal<string | null>(null);
  protected readonly creating = signal(false);
  protected readonly site = computed(() => this.sites().find((s) => s.id === this.siteId()) ?? null);
  protected readonly blocks = signal<Rec[]>([]);
  protected readonly treatments = signal<Rec[]>([]);
  protected readonly plots = signal<Rec[]>([]);
  protected readonly profiles = signal<Rec[]>([]);
  protected readonly analyzers = signal<Rec[]>([]);
  protected readonly collarsVersion = signal(0);
  protected readonly message = signal('');

  protected readonly blockColumns: ColumnDef[] = [
    { key: 'code', label: 'Block code', kind: 'text' },
    { key: 'name', label: 'Name', kind: 'text' },
  ];
  protected readonly treatmentColumns: ColumnDef[] = [
    { key: 'code', label: 'Treatment code', kind: 'text' },
    { key: 'name', label: 'Name', kind: 'text' },
    {
      key: 'level',
      label: 'Applied to',
      kind: 'select',
      options: () => [
        { value: 'plot', label: 'Whole plots' },
        { value: 'collar', label: 'Single collars' },
      ],
    },
  ];
  protected readonly plotColumns: ColumnDef[] = [
    { key: 'code', label: 'Plot code', kind: 'text' },
    { key: 'blockId', label: 'Block', kind: 'select', options: () => this.optionsOf(this.blocks()) },
    {
      key: 'treatmentId',
      label: 'Treatment',
      kind: 'select',
      options: () => this.optionsOf(this.treatments().filter((t) => t['level'] === 'plot')),
    },
  ];
  protected readonly profileColumns: ColumnDef[] = [
    { key: 'name', label: 'Profile name', kind: 'text' },
    { key: 'validFrom', label: 'Valid from', kind: 'date' },
    { key: 'chamberVolumeCm3', label: 'Chamber volume (cm³)', kind: 'number' },
    { key: 'loopVolumeCm3', label: 'Loop volume (cm³)', kind: 'number' },
    { key: 'settleS', label: 'Settle time (s)', kind: 'number' },
  ];
  protected readonly analyzerColumns: ColumnDef[] = [
    { key: 'name', label: 'Analyzer name', kind: 'text' },
    { key: 'serial', label: 'Serial number', kind: 'text' },
    { key: 'rangeMinPpm', label: 'Calibrated from (µmol/mol)', kind: 'number' },
    { key: 'rangeMaxPpm', label: 'Calibrated to (µmol/mol)', kind: 'number' },
    { key: 'precisionPpm', label: 'Precision (µmol/mol; default 1)', kind: 'number', optional: true },
    { key: 'calibrationIntervalDays', label: 'Calibrate every (days)', kind: 'number' },
  ];

  constructor() {
    void this.loadSites();
    effect(() => {
      const id = this.siteId();
      if (id) void this.loadLayout(id);
    });
  }

  private optionsOf(rows: Rec[]) {
    return [{ value: null, label: '(none)' }, ...rows.map((r) => ({ value: r.id, label: String(r['code']) }))];
  }

  private async loadSites(): Promise<void> {
    try {
      const sites = await this.api.list('sites');
      this.sites.set(sites);
      if (!this.siteId()) this.siteId.set(this.choice.current()?.id ?? sites[0]?.id ?? null);
    } catch (err) {
      this.message.set(serverMessage(err, 'Could not load the sites'));
    }
  }

  /** Lists the plot, profile, outline and check views choose from; each table loads its own rows as well. */
  protected async loadLayout(siteId: string): Promise<void> {
    const [blocks, treatments, plots, profiles, analyzers] = await Promise.all(
      ['blocks', 'treatments', 'plots', 'chamber-profiles', 'analyzers'].map((p) => this.api.list(p, { siteId }).catch(() => [] as Rec[])),
    );
    this.blocks.set(blocks!);
    this.treatments.set(treatments!);
    this.plots.set(plots!);
    this.profiles.set(profiles!);
    this.analyzers.set(analyzers!);
  }

  protected chooseSite(id: string): void {
    this.creating.set(false);
    this.siteId.set(id);
    this.choice.choose(id);
  }

  protected async siteSaved(rec: Rec): Promise<void> {
    this.sites.update((all) =>
      [...all.filter((s) => s.id !== rec.id), rec].sort((a, b) => String(a['name']).localeCompare(String(b['name']))),
    );
    this.creating.set(false);
    this.siteId.set(rec.id);
    await this.auth.refresh(); // the user menu's site list
    this.choice.choose(rec.id);
  }
}

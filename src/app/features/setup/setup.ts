import { ChangeDetectionStrategy, Component, computed, inject, linkedSignal, resource, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatSelectModule } from '@angular/material/select';
import { MatTabsModule } from '@angular/material/tabs';
import { AuthStore } from '../../core/auth/auth-store';
import { SiteChoice } from '../../core/auth/site-choice';
import type { StoredRecord } from '../../../../shared/model/stored-record';
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
import { loadedOr, loadProblem } from '../../core/api/resource-value';
import { SetupApi } from './setup-api';
import { SiteForm } from './site-form';

/** What the plot, profile, outline and check views choose from; each table loads its own rows as well. */
interface SiteLayout {
  blocks: StoredRecord<'block'>[];
  treatments: StoredRecord<'treatment'>[];
  plots: StoredRecord<'plot'>[];
  profiles: StoredRecord<'chamberProfile'>[];
  analyzers: StoredRecord<'analyzer'>[];
}
const NO_LAYOUT: SiteLayout = { blocks: [], treatments: [], plots: [], profiles: [], analyzers: [] };

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
  private readonly siteList = resource({ loader: () => this.api.list('site') });
  protected readonly sites = loadedOr(this.siteList, []);
  /** The site the person chose here, else the one chosen elsewhere in the app, else the first. */
  protected readonly siteId = linkedSignal<StoredRecord<'site'>[], string | null>({
    source: this.sites,
    computation: (sites, previous) => previous?.value ?? this.choice.current()?.id ?? sites[0]?.id ?? null,
  });
  protected readonly creating = signal(false);
  protected readonly site = computed(() => this.sites().find((s) => s.id === this.siteId()) ?? null);
  /** A lookup that fails leaves its list empty: the tables below say what went wrong with their own rows. */
  protected readonly layout = resource({
    params: () => this.siteId() ?? undefined,
    loader: async ({ params: siteId }): Promise<SiteLayout> => {
      const none = () => [];
      const [blocks, treatments, plots, profiles, analyzers] = await Promise.all([
        this.api.list('block', { siteId }).catch(none),
        this.api.list('treatment', { siteId }).catch(none),
        this.api.list('plot', { siteId }).catch(none),
        this.api.list('chamberProfile', { siteId }).catch(none),
        this.api.list('analyzer', { siteId }).catch(none),
      ]);
      return { blocks, treatments, plots, profiles, analyzers };
    },
  });
  private readonly layoutNow = loadedOr(this.layout, NO_LAYOUT);
  protected readonly blocks = computed(() => this.layoutNow().blocks);
  protected readonly treatments = computed(() => this.layoutNow().treatments);
  protected readonly plots = computed(() => this.layoutNow().plots);
  protected readonly profiles = computed(() => this.layoutNow().profiles);
  protected readonly analyzers = computed(() => this.layoutNow().analyzers);
  protected readonly collarsVersion = signal(0);
  protected readonly message = loadProblem(this.siteList, 'Could not load the sites');

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
      options: () => this.optionsOf(this.treatments().filter((t) => t.level === 'plot')),
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

  private optionsOf(rows: { id: string; code: string }[]) {
    return [{ value: null, label: '(none)' }, ...rows.map((r) => ({ value: r.id, label: r.code }))];
  }

  /** The lists above again, after a table or form below changed them. */
  protected reloadLayout(): void {
    this.layout.reload();
  }

  protected chooseSite(id: string): void {
    this.creating.set(false);
    this.siteId.set(id);
    this.choice.choose(id);
  }

  protected async siteSaved(rec: StoredRecord<'site'>): Promise<void> {
    this.siteList.set([...this.sites().filter((s) => s.id !== rec.id), rec].sort((a, b) => a.name.localeCompare(b.name)));
    this.creating.set(false);
    this.siteId.set(rec.id);
    await this.auth.refresh(); // the user menu's site list
    this.choice.choose(rec.id);
  }
}

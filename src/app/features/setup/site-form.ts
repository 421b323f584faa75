import { ChangeDetectionStrategy, Component, computed, inject, input, linkedSignal, output, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MAT_FORM_FIELD_DEFAULT_OPTIONS, MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { DEFAULT_SITE_AIR_TEMP_C } from '../../../../shared/flux/chamber-air-temperature';
import { pressureFromElevationKpa } from '../../../../shared/flux/standard-atmosphere';
import { DEFAULT_CALIBRATION_DRIFT_LIMIT_PCT } from '../../../../shared/model/calibration';
import { siteFields, siteProbeDepth } from '../../../../shared/model/site-layout';
import { fieldProblems, serverMessage } from '../../core/api/api-error';
import { issuesByField } from './record-fields';
import { SetupApi, type Rec } from './setup-api';

type Draft = Partial<Record<string, string>>;

const NUMBER_FIELDS = [
  'elevationM',
  'latitude',
  'longitude',
  'tempDepthCm',
  'tempDepthToleranceCm',
  'settlingDaysHard',
  'settlingDaysWarn',
  'offsetSpreadPct',
  'offsetMoveCm',
  'leakSlopeUmolMolS',
  'ambientMarginPpm',
  'calibrationDriftLimitPct',
  'defaultAirTempC',
] as const;
const NULLABLE = new Set(['elevationM', 'latitude', 'longitude', 'tileUrl', 'tileAttribution']);

/** Thresholds of the site, with the unit each is entered in and, where it helps, what it does. */
export const THRESHOLDS: readonly { key: (typeof NUMBER_FIELDS)[number]; label: string; unit: string; hint?: string }[] = [
  { key: 'settlingDaysHard', label: 'Settling days (refuse before)', unit: 'days' },
  { key: 'settlingDaysWarn', label: 'Settling days (warn before)', unit: 'days' },
  { key: 'offsetSpreadPct', label: 'Offset spread', unit: '%' },
  { key: 'offsetMoveCm', label: 'Offset move', unit: 'cm' },
  { key: 'leakSlopeUmolMolS', label: 'Leak-check slope', unit: 'µmol/mol/s' },
  { key: 'ambientMarginPpm', label: 'Start-above-ambient margin', unit: 'µmol/mol' },
  { key: 'calibrationDriftLimitPct', label: 'Calibration drift limit (of the span gas)', unit: '%' },
  { key: 'defaultAirTempC', label: 'Default air temperature (no chamber or visit reading)', unit: '°C' },
  { key: 'tempDepthCm', label: 'Soil temperature depth for responses', unit: 'cm' },
  {
    key: 'tempDepthToleranceCm',
    label: 'Soil temperature depth tolerance (±)',
    unit: 'cm',
    hint: 'A temperature further from the depth above is flagged off-depth, kept and left out of the visit mean (0–10 cm).',
  },
];

/** Creates or edits a site; checked with the shared site schema before it is sent. */
@Component({
  selector: 'fw-site-form',
  imports: [MatFormFieldModule, MatInputModule, MatSelectModule, MatButtonModule],
  // Hints and errors here run to two lines in a narrow field: the field grows with them instead of
  // letting them slide under the next field.
  providers: [{ provide: MAT_FORM_FIELD_DEFAULT_OPTIONS, useValue: { subscriptSizing: 'dynamic' } }],
  templateUrl: './site-form.html',
  styleUrl: './site-form.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SiteForm {
  private readonly api = inject(SetupApi);
  readonly site = input<Rec | null>(null);
  readonly saved = output<Rec>();

  protected readonly thresholds = THRESHOLDS;
  /** The form's values: the site's own, until the person types; a different site starts them afresh. */
  protected readonly draft = linkedSignal<Draft>(() => toDraft(this.site()));
  protected readonly errors = signal<Record<string, string>>({});
  protected readonly message = signal('');
  protected readonly busy = signal(false);
  /** US Standard Atmosphere 1976 pressure at the elevation: what closures without a pressure series use. */
  protected readonly defaultPressure = computed(() => {
    const raw = this.draft()['elevationM'] ?? '';
    const kpa = raw.trim() === '' ? NaN : pressureFromElevationKpa(Number(raw));
    return Number.isFinite(kpa) ? kpa.toFixed(2) : null;
  });

  protected set(key: string, value: string): void {
    this.draft.update((d) => ({ ...d, [key]: value }));
  }

  protected async save(): Promise<void> {
    const fields = fromDraft(this.draft());
    const check = siteFields.safeParse(fields);
    if (!check.success) {
      this.errors.set(issuesByField(check.error.issues));
      this.message.set('Some fields need attention');
      return;
    }
    this.busy.set(true);
    try {
      const current = this.site();
      const rec = current ? await this.api.update('sites', current.id, current.rev, fields) : await this.api.create('sites', fields);
      this.errors.set({});
      this.message.set(current ? 'Site saved' : 'Site created');
      this.saved.emit(rec);
    } catch (err) {
      this.errors.set(Object.fromEntries(fieldProblems(err).map((p) => [p.path, p.message])));
      this.message.set(serverMessage(err, 'The site was not saved'));
    } finally {
      this.busy.set(false);
    }
  }
}

function toDraft(site: Rec | null): Draft {
  const s = (site ?? {}) as Record<string, unknown>;
  const str = (v: unknown, d = '') => (v === null || v === undefined ? d : String(v));
  const cal = (s['moistureCalibration'] ?? { kind: 'topp' }) as {
    kind: string;
    coefficients?: number[];
    validMin?: number | null;
    validMax?: number | null;
  };
  return {
    name: str(s['name']),
    timezone: str(s['timezone'], Intl.DateTimeFormat().resolvedOptions().timeZone),
    elevationM: str(s['elevationM']),
    latitude: str(s['latitude']),
    longitude: str(s['longitude']),
    safetyNote: str(s['safetyNote']),
    calibration: cal.kind,
    coefficients: (cal.coefficients ?? []).join(', '),
    validMin: str(cal.validMin),
    validMax: str(cal.validMax),
    tempDepthCm: str(s['tempDepthCm'], '5'),
    tempDepthToleranceCm: str(s['tempDepthToleranceCm'], String(siteProbeDepth.parse({}).tempDepthToleranceCm)),
    settlingDaysHard: str(s['settlingDaysHard'], '1'),
    settlingDaysWarn: str(s['settlingDaysWarn'], '7'),
    offsetSpreadPct: str(s['offsetSpreadPct'], '3'),
    offsetMoveCm: str(s['offsetMoveCm'], '1'),
    leakSlopeUmolMolS: str(s['leakSlopeUmolMolS'], '0.05'),
    ambientMarginPpm: str(s['ambientMarginPpm'], '100'),
    slopeBasis: str(s['slopeBasis'], 'closure'),
    calibrationDriftLimitPct: str(s['calibrationDriftLimitPct'], String(DEFAULT_CALIBRATION_DRIFT_LIMIT_PCT)),
    digestLocalTime: str(s['digestLocalTime'], '18:00'),
    defaultAirTempC: str(s['defaultAirTempC'], String(DEFAULT_SITE_AIR_TEMP_C)),
    tileUrl: str(s['tileUrl']),
    tileAttribution: str(s['tileAttribution']),
  };
}

function fromDraft(d: Draft): Record<string, unknown> {
  const out: Record<string, unknown> = {
    name: d['name'] ?? '',
    timezone: d['timezone'] ?? '',
    safetyNote: d['safetyNote'] ?? '',
    digestLocalTime: d['digestLocalTime'] ?? '',
    slopeBasis: d['slopeBasis'] || 'closure',
  };
  for (const k of NUMBER_FIELDS) {
    const raw = (d[k] ?? '').trim();
    out[k] = raw === '' ? (NULLABLE.has(k) ? null : undefined) : Number(raw);
  }
  for (const k of ['tileUrl', 'tileAttribution']) out[k] = (d[k] ?? '').trim() === '' ? null : d[k];
  const num = (s: string | undefined) => ((s ?? '').trim() === '' ? null : Number(s));
  out['moistureCalibration'] =
    d['calibration'] === 'polynomial'
      ? {
          kind: 'polynomial',
          coefficients: (d['coefficients'] ?? '')
            .split(/[,;\s]+/)
            .filter(Boolean)
            .map(Number),
          validMin: num(d['validMin']),
          validMax: num(d['validMax']),
        }
      : { kind: 'topp' };
  return out;
}

import { ChangeDetectionStrategy, Component, computed, effect, inject, input, output, signal, untracked } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MAT_FORM_FIELD_DEFAULT_OPTIONS, MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { pressureFromElevationKpa } from '../../../../shared/flux/standard-atmosphere';
import type { EntityFields } from '../../../../shared/model/entities';
import { siteFields } from '../../../../shared/model/site-layout';
import type { StoredRecord } from '../../../../shared/model/stored-record';
import { fieldProblems, serverMessage } from '../../core/api/api-error';
import { issuesByField } from './record-fields';
import { formValue } from '../../core/forms/form-value';
import { SetupApi, type RecordInput } from './setup-api';

type Site = EntityFields<'site'>;

/** Number fields a site must have: left empty, the stored value (or, for a new site, the schema's default) stays. */
type ThresholdKey =
  | 'tempDepthCm'
  | 'tempDepthToleranceCm'
  | 'settlingDaysHard'
  | 'settlingDaysWarn'
  | 'offsetSpreadPct'
  | 'offsetMoveCm'
  | 'leakSlopeUmolMolS'
  | 'ambientMarginPpm'
  | 'calibrationDriftLimitPct'
  | 'defaultAirTempC';

/** One value per threshold, made by `make`. */
function thresholdsOf<T>(make: (key: ThresholdKey) => T): Record<ThresholdKey, T> {
  return {
    tempDepthCm: make('tempDepthCm'),
    tempDepthToleranceCm: make('tempDepthToleranceCm'),
    settlingDaysHard: make('settlingDaysHard'),
    settlingDaysWarn: make('settlingDaysWarn'),
    offsetSpreadPct: make('offsetSpreadPct'),
    offsetMoveCm: make('offsetMoveCm'),
    leakSlopeUmolMolS: make('leakSlopeUmolMolS'),
    ambientMarginPpm: make('ambientMarginPpm'),
    calibrationDriftLimitPct: make('calibrationDriftLimitPct'),
    defaultAirTempC: make('defaultAirTempC'),
  };
}

/** What a new site starts with: the shared schema's defaults (name, zone and elevation are the person's to give). */
const NEW_SITE: Omit<Site, 'name' | 'timezone' | 'elevationM'> = siteFields
  .omit({ name: true, timezone: true, elevationM: true })
  .parse({});

const text = (value = '') => new FormControl(value, { nonNullable: true });
const num = () => new FormControl<number | null>(null);

function siteForm() {
  return new FormGroup({
    name: text(),
    timezone: text(),
    elevationM: num(),
    latitude: num(),
    longitude: num(),
    safetyNote: text(),
    calibration: new FormControl<'topp' | 'polynomial'>('topp', { nonNullable: true }),
    coefficients: text(),
    validMin: num(),
    validMax: num(),
    slopeBasis: new FormControl(NEW_SITE.slopeBasis, { nonNullable: true }),
    ...thresholdsOf(num),
    digestLocalTime: text(),
    tileUrl: text(),
    tileAttribution: text(),
  });
}
type SiteFormValue = ReturnType<ReturnType<typeof siteForm>['getRawValue']>;

/** Thresholds of the site, with the unit each is entered in and, where it helps, what it does. */
export const THRESHOLDS: readonly { key: ThresholdKey; label: string; unit: string; hint?: string }[] = [
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
  imports: [ReactiveFormsModule, MatFormFieldModule, MatInputModule, MatSelectModule, MatButtonModule],
  // Hints and errors here run to two lines in a narrow field: the field grows with them instead of
  // letting them slide under the next field.
  providers: [{ provide: MAT_FORM_FIELD_DEFAULT_OPTIONS, useValue: { subscriptSizing: 'dynamic' } }],
  templateUrl: './site-form.html',
  styleUrl: './site-form.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SiteForm {
  private readonly api = inject(SetupApi);
  readonly site = input<StoredRecord<'site'> | null>(null);
  readonly saved = output<StoredRecord<'site'>>();

  protected readonly thresholds = THRESHOLDS;
  protected readonly form = siteForm();
  private readonly value = formValue(this.form);
  protected readonly errors = signal<Record<string, string>>({});
  protected readonly message = signal('');
  protected readonly busy = signal(false);
  protected readonly polynomial = computed(() => this.value().calibration === 'polynomial');
  /** US Standard Atmosphere 1976 pressure at the elevation: what closures without a pressure series use. */
  protected readonly defaultPressure = computed(() => {
    const elevation = this.value().elevationM;
    const kpa = elevation === null ? NaN : pressureFromElevationKpa(elevation);
    return Number.isFinite(kpa) ? kpa.toFixed(2) : null;
  });

  constructor() {
    // Fills the form (reactive forms hold their own state) with the site shown; another site starts it afresh.
    effect(() => {
      const site = this.site();
      untracked(() => {
        this.form.reset(valuesOf(site));
        this.errors.set({});
      });
    });
  }

  protected async save(): Promise<void> {
    const fields = siteInput(this.form.getRawValue());
    const check = siteFields.safeParse(fields);
    if (!check.success) {
      this.errors.set(issuesByField(check.error.issues));
      this.message.set('Some fields need attention');
      return;
    }
    this.busy.set(true);
    try {
      const current = this.site();
      const rec = current ? await this.api.update('site', current.id, current.rev, fields) : await this.api.create('site', fields);
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

/** The form's values for a site; a new site takes the schema's defaults and the device's time zone. */
function valuesOf(stored: StoredRecord<'site'> | null): SiteFormValue {
  // A copy stored before a field existed lacks it: the schema's default shows, as the server would fill it.
  const site = { ...NEW_SITE, name: '', timezone: Intl.DateTimeFormat().resolvedOptions().timeZone, elevationM: null, ...stored };
  const cal = site.moistureCalibration;
  return {
    name: site.name,
    timezone: site.timezone,
    elevationM: site.elevationM,
    latitude: site.latitude,
    longitude: site.longitude,
    safetyNote: site.safetyNote,
    calibration: cal.kind,
    coefficients: cal.kind === 'polynomial' ? cal.coefficients.join(', ') : '',
    validMin: cal.kind === 'polynomial' ? cal.validMin : null,
    validMax: cal.kind === 'polynomial' ? cal.validMax : null,
    slopeBasis: site.slopeBasis,
    ...thresholdsOf((k) => site[k]),
    digestLocalTime: site.digestLocalTime,
    tileUrl: site.tileUrl ?? '',
    tileAttribution: site.tileAttribution ?? '',
  };
}

/** The fields sent: an emptied threshold is left out (the stored value stays), empty optional texts are null. */
function siteInput(v: SiteFormValue): RecordInput<'site'> {
  const blankToNull = (s: string) => (s.trim() === '' ? null : s);
  return {
    name: v.name,
    timezone: v.timezone,
    elevationM: v.elevationM,
    latitude: v.latitude,
    longitude: v.longitude,
    safetyNote: v.safetyNote,
    slopeBasis: v.slopeBasis,
    ...thresholdsOf((k) => v[k] ?? undefined),
    digestLocalTime: v.digestLocalTime,
    tileUrl: blankToNull(v.tileUrl),
    tileAttribution: blankToNull(v.tileAttribution),
    moistureCalibration:
      v.calibration === 'polynomial'
        ? {
            kind: 'polynomial',
            coefficients: v.coefficients
              .split(/[,;\s]+/)
              .filter(Boolean)
              .map(Number),
            validMin: v.validMin,
            validMax: v.validMax,
          }
        : { kind: 'topp' },
  };
}

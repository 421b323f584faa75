/**
 * The tables of a results export: our own column names, each with its type, unit and meaning.
 * The same definitions write the CSV headers, the Frictionless table schemas (datapackage.json)
 * and the EML attribute lists, so the three can never disagree.
 */
import { REVIEW_STATES } from '../../shared/model/progress-state';

export type FieldType = 'string' | 'number' | 'integer' | 'boolean' | 'date' | 'datetime';

/** `enum`, `minimum`, `maximum` become Table Schema constraints; `decimals` is the precision the value carries (rounding in the CSV). */
export interface FieldDef {
  name: string;
  type: FieldType;
  unit?: string;
  description: string;
  required?: boolean;
  enum?: readonly string[];
  minimum?: number;
  maximum?: number;
  decimals?: number;
  /** A site-local copy of the UTC datetime field named here: filled by the export, never by a row source. */
  localOf?: string;
}
export interface ForeignKey {
  fields: string[];
  reference: { resource: string; fields: string[] };
}
export interface TableDef {
  name: string;
  title: string;
  description: string;
  fields: FieldDef[];
  primaryKey?: string[];
  foreignKeys?: ForeignKey[];
}

const id = (name: string, what: string): FieldDef => ({ name, type: 'string', description: `${what} (UUID)`, required: true });
const ref = (name: string, what: string): FieldDef => ({ name, type: 'string', description: `${what} (UUID)` });
const num = (name: string, unit: string, description: string, more: Partial<FieldDef> = {}): FieldDef => ({
  name,
  type: 'number',
  unit,
  description,
  ...more,
});
const oneOf = (name: string, values: readonly string[], description: string): FieldDef => ({
  name,
  type: 'string',
  description,
  enum: values,
});
const count = (name: string, description: string): FieldDef => ({ name, type: 'integer', description, minimum: 0 });
const str = (name: string, description: string): FieldDef => ({ name, type: 'string', description });
/** Written where the site's IANA zone goes in a description; tablesForSite puts the zone in. */
const SITE_ZONE = '{site zone}';
/** Written where the site's soil-temperature depth tolerance (cm) goes; tablesForSite puts the value in. */
const SITE_TOLERANCE = '{site tolerance}';
/** UTC datetime field followed by its site-local twin: exports keep UTC and add the wall time people noted. */
const at = (name: string, what: string): FieldDef[] => [
  { name, type: 'datetime', description: `${what}, UTC` },
  {
    name: `${name}_local`,
    type: 'datetime',
    localOf: name,
    description: `${what}, local time at the site (${SITE_ZONE}), ISO 8601 with that moment's UTC offset`,
  },
];
const fk = (field: string, resource: string, target = field): ForeignKey => ({
  fields: [field],
  reference: { resource, fields: [target] },
});

export const UNITS = {
  flux: 'umol m-2 s-1',
  total: 'g C m-2',
  cm: 'cm',
  cm2: 'cm2',
  cm3: 'cm3',
  s: 's',
  degC: 'degC',
  percent: 'percent',
  ppm: 'umol mol-1',
  mmolMol: 'mmol mol-1',
  kPa: 'kPa',
  degree: 'degree',
  ppmPerS: 'umol mol-1 s-1',
  kelvin: 'K',
  day: 'd',
  none: 'dimensionless',
} as const;

const FLUX_NOTE = 'CO2 efflux, µmol CO2 m-2 s-1';

export const TABLES: TableDef[] = [
  {
    name: 'collars',
    title: 'Collars',
    description: 'Permanent soil collars with their plot, block and treatments.',
    primaryKey: ['collar_id'],
    fields: [
      id('collar_id', 'Collar'),
      str('collar_code', 'Collar code written on its tag'),
      ref('plot_id', 'Plot'),
      str('plot_code', 'Plot code'),
      str('block_code', 'Block code (a factor of the design)'),
      str('plot_treatment', 'Code of the plot-level treatment'),
      str('collar_treatment', 'Code of the collar-level treatment, empty when none'),
      str('shape', 'round or rectangular'),
      num('diameter_cm', UNITS.cm, 'Inner diameter of a round collar'),
      num('area_cm2', UNITS.cm2, 'Soil area inside the collar'),
      num('height_cm', UNITS.cm, 'Collar height'),
      num('insertion_cm', UNITS.cm, 'Depth the collar was driven into the soil'),
      num('latitude', UNITS.degree, 'WGS 84 latitude', { minimum: -90, maximum: 90, decimals: 7 }),
      num('longitude', UNITS.degree, 'WGS 84 longitude', { minimum: -180, maximum: 180, decimals: 7 }),
      { name: 'installed_on', type: 'date', description: 'Installation day' },
      str('status', 'active, damaged or retired'),
    ],
  },
  {
    name: 'collar_events',
    title: 'Collar events',
    description: 'Installations, clippings, reseats, replacements, damage and retirement.',
    primaryKey: ['event_id'],
    foreignKeys: [fk('collar_id', 'collars')],
    fields: [
      id('event_id', 'Event'),
      ref('collar_id', 'Collar'),
      str('kind', 'installed, clipped, reseated, replaced, damaged or retired'),
      { name: 'date', type: 'date', description: 'Day of the event' },
      str('note', 'Free text'),
    ],
  },
  {
    name: 'analyzers',
    title: 'Analyzers',
    description: 'Gas analyzers with range, precision (used for the detection limit) and calibration interval.',
    primaryKey: ['analyzer_id'],
    fields: [
      id('analyzer_id', 'Analyzer'),
      str('name', 'Analyzer name'),
      str('serial', 'Serial number'),
      num('range_min_ppm', UNITS.ppm, 'Lower end of the CO2 range'),
      num('range_max_ppm', UNITS.ppm, 'Upper end of the CO2 range'),
      num('precision_ppm', UNITS.ppm, 'CO2 precision; empty when not known (the detection limit then uses 1 µmol mol-1)', { minimum: 0 }),
      num('calibration_interval_days', UNITS.day, 'Days between zero/span calibrations the site asks for', { minimum: 0 }),
    ],
  },
  {
    name: 'analyzer_checks',
    title: 'Analyzer checks',
    primaryKey: ['check_id'],
    foreignKeys: [fk('analyzer_id', 'analyzers')],
    description:
      'Checks of the day other than calibrations (those are in calibrations.csv): leak, ambient, clock, warm-up and safety acknowledgement.',
    fields: [
      id('check_id', 'Check record'),
      ref('analyzer_id', 'Analyzer'),
      oneOf('kind', ['leak', 'ambient', 'clock', 'warm-up', 'safety-ack'], 'leak, ambient, clock, warm-up or safety-ack'),
      ...at('checked_at', 'Time of the check'),
      { name: 'skipped', type: 'boolean', description: 'The check was skipped' },
      str('skip_reason', 'Why it was skipped'),
      { name: 'passed', type: 'boolean', description: 'The check passed; empty when not judged' },
      num('co2_ppm', UNITS.ppm, 'Ambient CO2 read (ambient check)'),
      num('slope_ppm_s', UNITS.ppmPerS, 'CO2 slope with the chamber sealed on a blank (leak check)'),
      num('clock_offset_s', UNITS.s, 'Analyzer clock minus reference clock (clock check)'),
      str('note', 'Free text'),
    ],
  },
  {
    name: 'chamber_profiles',
    title: 'Chamber profile versions',
    primaryKey: ['profile_id'],
    description:
      'Chamber geometry versions: each applies to closures from valid_from until the day before the next version of the same name.',
    fields: [
      id('profile_id', 'Chamber profile version'),
      str('name', 'Profile name (the versions of one chamber share it)'),
      { name: 'valid_from', type: 'date', description: 'First day this version applies' },
      { name: 'valid_to', type: 'date', description: 'Last day it applies (the day before the next version); empty while current' },
      num('chamber_volume_cm3', UNITS.cm3, 'Chamber headspace volume', { minimum: 0 }),
      num('loop_volume_cm3', UNITS.cm3, 'Tubing and analyzer cell volume', { minimum: 0 }),
      num('footprint_area_cm2', UNITS.cm2, 'Chamber footprint area (the volume adds footprint × mean collar offset)', { minimum: 0 }),
      num('settle_s', UNITS.s, 'Default settle time', { minimum: 0 }),
      num('closure_length_s', UNITS.s, 'Default closure length', { minimum: 0 }),
    ],
  },
  {
    name: 'calibrations',
    title: 'Analyzer calibrations',
    primaryKey: ['calibration_id'],
    foreignKeys: [fk('analyzer_id', 'analyzers')],
    description:
      'Zero/span calibrations of the gas analyzers: gases, cylinders, readings before (as found) and after (as left) adjustment, drift against the site limit.',
    fields: [
      id('calibration_id', 'Calibration record'),
      ref('analyzer_id', 'Analyzer'),
      str('analyzer_name', 'Analyzer name'),
      str('analyzer_serial', 'Analyzer serial number'),
      ...at('calibrated_at', 'Time of the calibration'),
      str('recorded_by', 'Who recorded it (display name)'),
      { name: 'skipped', type: 'boolean', description: 'The calibration was skipped' },
      str('skip_reason', 'Why it was skipped'),
      { name: 'passed', type: 'boolean', description: 'Left within the site limit after adjustment; empty when not judged' },
      num('zero_gas_ppm', UNITS.ppm, 'CO2 concentration of the zero gas'),
      str('zero_cylinder', 'Zero gas cylinder id, empty for scrubbed air'),
      num('zero_before_ppm', UNITS.ppm, 'Reading of the zero gas before adjustment'),
      num('zero_after_ppm', UNITS.ppm, 'Reading of the zero gas after adjustment'),
      num('zero_drift_ppm', UNITS.ppm, 'Zero drift: reading before − zero gas'),
      num('span_gas_ppm', UNITS.ppm, 'Certified CO2 concentration of the span gas'),
      str('span_cylinder', 'Span gas cylinder id'),
      num('span_before_ppm', UNITS.ppm, 'Reading of the span gas before adjustment'),
      num('span_after_ppm', UNITS.ppm, 'Reading of the span gas after adjustment'),
      num('span_drift_ppm', UNITS.ppm, 'Span drift: reading before − span gas'),
      num('drift_pct', UNITS.percent, 'Larger of |zero drift| and |span drift| in % of the span gas concentration'),
      num('drift_limit_pct', UNITS.percent, 'The site limit for drift in % of the span gas concentration'),
      { name: 'over_limit', type: 'boolean', description: 'drift_pct is above drift_limit_pct; empty when no drift was recorded' },
      str('note', 'Free text'),
    ],
  },
  {
    name: 'visits',
    title: 'Visits',
    description: 'One crew stop at one collar in one round of a campaign.',
    primaryKey: ['visit_id'],
    foreignKeys: [fk('collar_id', 'collars')],
    fields: [
      id('visit_id', 'Visit'),
      ref('campaign_id', 'Campaign'),
      str('campaign_name', 'Campaign name'),
      count('round', 'Round number within the campaign'),
      ref('collar_id', 'Collar'),
      ...at('arrived_at', 'Arrival time'),
      { name: 'skipped', type: 'boolean', description: 'The collar was skipped in this round' },
      str('skip_reason', 'Why it was skipped'),
      str('conditions', 'Visit conditions as a JSON object (standing water, animal, trampling, notes)'),
    ],
  },
  {
    name: 'offset_sets',
    title: 'Offset sets',
    description: 'Collar rim heights above the soil read around the rim at one visit.',
    primaryKey: ['offset_set_id'],
    foreignKeys: [fk('visit_id', 'visits'), fk('collar_id', 'collars')],
    fields: [
      id('offset_set_id', 'Offset set'),
      ref('visit_id', 'Visit'),
      ref('collar_id', 'Collar'),
      ...at('taken_at', 'Time'),
      num('mean_offset_cm', UNITS.cm, 'Mean rim height above the soil'),
      num('sd_offset_cm', UNITS.cm, 'Standard deviation of the readings'),
      count('n_readings', 'Number of readings'),
      str('readings_cm', 'The readings in cm, separated by semicolons'),
      ref('supersedes_id', 'Offset set this one replaces'),
    ],
  },
  {
    name: 'probe_readings',
    title: 'Probe readings',
    description:
      "Every probe insertion (replicate) of a visit: soil moisture and the soil temperature at the site's response depth. A visit's value is the mean of its replicates (visit_means).",
    primaryKey: ['probe_reading_id'],
    foreignKeys: [fk('visit_id', 'visits')],
    fields: [
      id('probe_reading_id', 'Probe reading'),
      ref('visit_id', 'Visit'),
      ref('collar_id', 'Collar'),
      ...at('taken_at', 'Time'),
      num(
        'soil_temp_c',
        UNITS.degC,
        `Soil temperature at the site's response depth (within ±${SITE_TOLERANCE} cm, the site's depth tolerance; the nearest)`,
        { decimals: 2 },
      ),
      num(
        'vwc_pct',
        UNITS.percent,
        "Volumetric water content: the VWC reading, or the permittivity through the site's calibration (Topp et al. 1980 unless set)",
        { decimals: 2 },
      ),
      oneOf('moisture_kind', ['vwc', 'permittivity'], 'What the probe gave: vwc (a VWC in %) or permittivity (apparent permittivity Ka)'),
      num('moisture_vwc_reading_pct', UNITS.percent, "The probe's own VWC reading (moisture_kind vwc)", { minimum: 0, maximum: 100 }),
      num('moisture_permittivity', UNITS.none, 'Apparent permittivity Ka as read (moisture_kind permittivity)', {
        minimum: 1,
        maximum: 90,
      }),
      str(
        'flags',
        `Plausible-range flags (soil-temp-implausible, vwc-implausible, permittivity-implausible) and soil-temp-off-depth (a temperature more than ±${SITE_TOLERANCE} cm, the site's depth tolerance, from the response depth, left out of the visit mean) separated by semicolons; see the EML methods`,
      ),
    ],
  },
  {
    name: 'probe_soil_temperatures',
    title: 'Probe soil temperatures',
    description: 'Every soil temperature of a probe reading with its depth.',
    foreignKeys: [fk('probe_reading_id', 'probe_readings')],
    fields: [
      ref('probe_reading_id', 'Probe reading'),
      num('depth_cm', UNITS.cm, 'Depth below the soil surface'),
      num('soil_temp_c', UNITS.degC, 'Soil temperature'),
    ],
  },
  {
    name: 'closures',
    title: 'Closures',
    description: "Chamber closures with the raw fit, the review fit, QC flags and the lab's decision.",
    primaryKey: ['closure_id'],
    foreignKeys: [
      fk('visit_id', 'visits'),
      fk('collar_id', 'collars'),
      fk('profile_id', 'chamber_profiles'),
      fk('analyzer_id', 'analyzers'),
    ],
    fields: [
      id('closure_id', 'Closure'),
      ref('visit_id', 'Visit'),
      ref('collar_id', 'Collar'),
      ref('campaign_id', 'Campaign'),
      ...at('started_at', 'Chamber closed'),
      num('settle_s', UNITS.s, 'Settle time skipped by the raw fit'),
      oneOf('review_state', REVIEW_STATES, 'unreviewed, accepted or rejected'),
      str('review_reason', 'Reason given for a rejection'),
      num('review_settle_s', UNITS.s, 'Settle time chosen by the lab'),
      num('review_window_end_s', UNITS.s, 'End of the fit window chosen by the lab'),
      str('review_model', 'Rate model chosen by the lab'),
      str(
        'review_excluded_samples',
        "Samples the lab left out of the review fit: 0-based positions in the closure's series (closure_series.csv sample order), separated by semicolons; empty when none",
      ),
      str('raw_model', 'Rate model the raw fit selected'),
      num('raw_slope_ppm_s', UNITS.ppmPerS, 'Initial slope of dry CO2, raw fit'),
      num('raw_flux_umol_m2_s', UNITS.flux, `${FLUX_NOTE}, raw fit`),
      num('raw_r2', UNITS.none, 'R² of the selected raw model'),
      str('review_fit_model', 'Rate model of the review fit'),
      num('review_flux_umol_m2_s', UNITS.flux, `${FLUX_NOTE}, review fit`),
      num('flux_umol_m2_s', UNITS.flux, `${FLUX_NOTE}: the review fit's flux when reviewed, else the raw fit's`),
      oneOf(
        'flux_basis',
        ['closure', 'settle_end'],
        'Where the flux takes the slope of a curved model: closure (t = 0, chamber closure) or settle_end (end of the settle time); a line has one slope',
      ),
      num(
        'min_detectable_flux_umol_m2_s',
        UNITS.flux,
        'Minimum detectable flux of the fit behind flux_umol_m2_s: precision_ppm / fit window length × flux per slope',
      ),
      num('precision_ppm', UNITS.ppm, 'Analyzer precision used for the detection limit (1 µmol mol-1 when the analyzer has none)'),
      num('fit_first_t_s', UNITS.s, 'First sample time used by the fit behind flux_umol_m2_s'),
      num('fit_last_t_s', UNITS.s, 'Last sample time used by that fit'),
      count('fit_n', 'Samples used by that fit'),
      num(
        'flux_per_slope',
        UNITS.none,
        'p·V·(1 − χw)/(R·T·A) × 10 of that fit: µmol m-2 s-1 of flux per µmol mol-1 s-1 of dry CO2 slope (p, T, χw of the first sample used)',
      ),
      str('flags', 'QC flags separated by semicolons; see the EML methods'),
      num('volume_cm3', UNITS.cm3, 'Total system volume'),
      num('area_cm2', UNITS.cm2, 'Soil area'),
      num('mean_offset_cm', UNITS.cm, 'Mean collar offset used for the volume'),
      {
        name: 'pressure_is_default',
        type: 'boolean',
        description: 'Pressure taken from site elevation (US Standard Atmosphere 1976), not measured',
      },
      ref('profile_id', "Chamber profile version the volume came from (the closure's own chamber, its version valid that day)"),
      str('profile_name', 'Chamber the closure was made with'),
      ref('analyzer_id', 'Analyzer the closure was made with'),
      num(
        'ambient_ppm',
        UNITS.ppm,
        "Ambient CO2 reading of the closure's own analyzer nearest in time (within 12 h) used for start-above-ambient",
      ),
      oneOf(
        'air_temp_source',
        ['series', 'visit', 'site-default'],
        'Where the chamber air temperature came from: series (the analyzer file), visit (air temperature noted at the visit) or site-default',
      ),
      num(
        'air_temp_c',
        UNITS.degC,
        "Chamber air temperature used when it did not come from the file (visit or site default); empty when the file's own values were used",
      ),
    ],
  },
  {
    name: 'closure_series',
    title: 'Closure raw series',
    description: 'Every sample of every closure as the analyzer gave it (wet CO2).',
    foreignKeys: [fk('closure_id', 'closures')],
    fields: [
      ref('closure_id', 'Closure'),
      num('t_s', UNITS.s, 'Seconds since the chamber closed'),
      num('co2_ppm', UNITS.ppm, 'CO2 mole fraction as measured (wet)'),
      num('h2o_mmol_mol', UNITS.mmolMol, 'Water vapour mole fraction'),
      num('chamber_temp_c', UNITS.degC, 'Chamber air temperature'),
      num('pressure_kpa', UNITS.kPa, 'Chamber pressure'),
    ],
  },
  {
    name: 'soil_temperature_logs',
    title: 'Soil temperature logs',
    description: 'Continuous logger series per plot and depth used for seasonal totals.',
    fields: [
      ref('plot_id', 'Plot'),
      num('depth_cm', UNITS.cm, 'Logger depth'),
      ...at('t', 'Time'),
      num('soil_temp_c', UNITS.degC, 'Soil temperature'),
    ],
  },
  {
    name: 'visit_means',
    title: 'Visit means',
    description: 'Mean flux of the selected closures of each visit, with soil temperature and moisture.',
    primaryKey: ['visit_id'],
    foreignKeys: [fk('visit_id', 'visits')],
    fields: [
      ref('visit_id', 'Visit'),
      ref('collar_id', 'Collar'),
      ref('plot_id', 'Plot'),
      str('cell', 'Treatment cell: plot treatment|collar treatment'),
      ref('campaign_id', 'Campaign'),
      count('n_closures', 'Closures averaged'),
      num('flux_umol_m2_s', UNITS.flux, FLUX_NOTE),
      num(
        'soil_temp_c',
        UNITS.degC,
        `Mean soil temperature of the visit's probe replicates at the response depth (±${SITE_TOLERANCE} cm, the site's depth tolerance)`,
      ),
      num('soil_temp_sd_c', UNITS.degC, 'Sample standard deviation (n − 1) of those temperatures; empty below two'),
      count('soil_temp_n', 'Replicates behind soil_temp_c'),
      count(
        'soil_temp_off_depth_n',
        `Temperatures more than ±${SITE_TOLERANCE} cm from the response depth, left out of soil_temp_c (flagged in probe_readings)`,
      ),
      num('vwc_pct', UNITS.percent, "Mean volumetric water content of the visit's probe replicates", { minimum: 0, maximum: 100 }),
      num('vwc_sd_pct', UNITS.percent, "Sample standard deviation (n − 1) of the replicates' VWC; empty below two"),
      count('vwc_n', 'Replicates behind vwc_pct'),
    ],
  },
  {
    name: 'plot_means',
    title: 'Plot means',
    description: 'Per campaign and treatment cell: the mean over collars of their visit means (the replicate).',
    fields: [
      ref('plot_id', 'Plot'),
      str('plot_code', 'Plot code'),
      str('block_code', 'Block code'),
      str('cell', 'Treatment cell'),
      ref('campaign_id', 'Campaign'),
      count('n_collars', 'Collars'),
      count('n_visits', 'Visits'),
      count('n_closures', 'Closures'),
      num('flux_umol_m2_s', UNITS.flux, FLUX_NOTE),
      num('soil_temp_c', UNITS.degC, 'Soil temperature'),
      num('vwc_pct', UNITS.percent, 'Volumetric water content', { minimum: 0, maximum: 100 }),
    ],
  },
  {
    name: 'treatment_means',
    title: 'Treatment means',
    description: 'Per campaign: treatment cell mean ± SE over plots, with the block-adjusted SE.',
    primaryKey: ['cell', 'campaign_id'],
    fields: [
      str('cell', 'Treatment cell'),
      str('cell_label', 'Treatment cell as shown'),
      oneOf('level', ['plot', 'collar'], 'plot or collar'),
      ref('campaign_id', 'Campaign'),
      str('campaign_name', 'Campaign name'),
      count('n_plots', 'Plots (the replicates)'),
      count('n_collars', 'Collars'),
      count('n_visits', 'Visits'),
      count('n_closures', 'Closures'),
      num('mean_flux_umol_m2_s', UNITS.flux, `Mean ${FLUX_NOTE} over plots`),
      num('sd_flux_umol_m2_s', UNITS.flux, 'Standard deviation over plots'),
      num('se_flux_umol_m2_s', UNITS.flux, 'Standard error over plots'),
      num(
        'se_block_flux_umol_m2_s',
        UNITS.flux,
        'SE of the least-squares mean in the additive model: cell + block for plot-level cells, cell + plot for collar-level cells',
      ),
      num('soil_temp_c', UNITS.degC, 'Mean soil temperature'),
      num('vwc_pct', UNITS.percent, 'Mean volumetric water content'),
    ],
  },
  {
    name: 'temperature_responses',
    title: 'Temperature responses',
    description:
      'Q10 and Lloyd & Taylor (1994) fits per treatment cell on plot × campaign × round means (the experimental unit), on the flux scale ' +
      '(non-linear least squares) and on the log scale (least squares on ln flux), with 95 % CIs from t(n − 2), n = units.',
    fields: [
      str('cell', 'Treatment cell'),
      oneOf('model', ['q10', 'lloyd-taylor', 'q10-log', 'lloyd-taylor-log'], 'q10, lloyd-taylor, q10-log or lloyd-taylor-log'),
      { name: 'fitted', type: 'boolean', description: 'The model was fitted' },
      str('refusal', 'Why the model was not fitted'),
      count('n', 'Plot × campaign × round means used'),
      count('n_plots', 'Plots behind them (independent units)'),
      num('temp_span_c', UNITS.degC, 'Temperature span'),
      num('r10_umol_m2_s', UNITS.flux, 'Flux at 10 °C'),
      num('r10_ci_low', UNITS.flux, '95 % CI'),
      num('r10_ci_high', UNITS.flux, '95 % CI'),
      num('q10', UNITS.none, 'Q10'),
      num('q10_ci_low', UNITS.none, '95 % CI'),
      num('q10_ci_high', UNITS.none, '95 % CI'),
      num('e0_k', UNITS.kelvin, 'Lloyd & Taylor E0 (T0 = 227.13 K fixed)'),
      num('e0_ci_low', UNITS.kelvin, '95 % CI'),
      num('e0_ci_high', UNITS.kelvin, '95 % CI'),
      num('rmse_umol_m2_s', UNITS.flux, 'Root-mean-square residual of a flux-scale fit (q10, lloyd-taylor); empty for log-scale fits'),
      num(
        'rmse_ln',
        UNITS.none,
        'Root-mean-square residual of ln flux of a log-scale fit (q10-log, lloyd-taylor-log); empty for flux-scale fits',
      ),
      str('warnings', 'Warnings separated by semicolons'),
    ],
  },
  {
    name: 'seasonal_totals',
    title: 'Seasonal totals',
    description:
      'Cumulative carbon efflux per plot and treatment cell over the stated period; a total is given only when every plot has a value ' +
      "for every day. Cell rows carry a 95 % Student t interval over the plots' totals: it includes the variation between plots and what varies " +
      'plot by plot, and leaves out the uncertainty of the response parameters and of the gap filling (not propagated).',
    fields: [
      str('cell', 'Treatment cell'),
      ref('plot_id', 'Plot, empty for the cell mean'),
      str('plot_code', 'Plot code'),
      { name: 'from_day', type: 'date', description: 'First day' },
      { name: 'to_day', type: 'date', description: 'Last day' },
      str('status', 'complete, partial (plots with too little signal left out), incomplete (missing days: no total) or too little signal'),
      num('total_g_c_m2', UNITS.total, 'Carbon released as CO2, g C m-2 (C = 12.011 g mol-1); empty unless every day has a value', {
        decimals: 3,
      }),
      num('ci_low_g_c_m2', UNITS.total, '95 % Student t interval over plot totals (cell rows)', { decimals: 3 }),
      num('ci_high_g_c_m2', UNITS.total, '95 % Student t interval over plot totals', { decimals: 3 }),
      count('period_days', 'Days from from_day to to_day, both included'),
      count('n_plots', 'Plots of the cell (cell rows); 1 on plot rows'),
      count(
        'days_logged',
        'Days of this plot from logged temperature through the fitted response (plot rows; empty on cell rows, which would add days across plots)',
      ),
      count('days_interpolated', 'Days of this plot gap-filled by interpolation between campaigns (plot rows)'),
      count('days_missing', 'Days of this plot with neither (plot rows)'),
      count(
        'days_outside_range',
        'Days of this plot whose logged temperature left the fitted range, not taken from the response (plot rows)',
      ),
      num('log_depth_cm', UNITS.cm, 'Depth of the temperature log used (plot rows)'),
      num('response_depth_cm', UNITS.cm, 'Depth of the probe temperatures the response was fitted on'),
      str('flags', 'Reasons to read the total with care, separated by semicolons'),
    ],
  },
];

export const tablePath = (name: string) => `data/${name}.csv`;

/**
 * The tables with the site's zone named in every local-time field's description and its depth
 * tolerance in every probe-temperature one (CSV headers, datapackage.json, EML).
 */
export function tablesForSite(site: { timezone: string; tempDepthToleranceCm: number }): TableDef[] {
  const fill = (d: string) => d.replace(SITE_ZONE, site.timezone).replaceAll(SITE_TOLERANCE, String(site.tempDepthToleranceCm));
  return TABLES.map((t) => ({ ...t, fields: t.fields.map((f) => ({ ...f, description: fill(f.description) })) }));
}

/** The fields a row source writes: every field but the local-time twins. */
export const sourceFields = (t: TableDef): FieldDef[] => t.fields.filter((f) => !f.localOf);

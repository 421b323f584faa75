import { z } from 'zod';
import { calibrationDrifts, DEFAULT_CALIBRATION_DRIFT_LIMIT_PCT } from './calibration';
import { isoDate, name, ranged, text, uuid } from './common';

export const moistureCalibrationSchema = z.discriminatedUnion('kind', [
  z.object({ kind: z.literal('topp') }),
  z.object({
    kind: z.literal('polynomial'),
    /** VWC (m³ m⁻³) = c0 + c1·x + c2·x² + …, x the raw probe value. */
    coefficients: z.array(z.number().finite()).min(2).max(6),
    validMin: z.number().finite().nullable().default(null),
    validMax: z.number().finite().nullable().default(null),
  }),
]);

export const siteFields = z.object({
  name: name('site name'),
  timezone: z.string().min(1).max(64).refine(isTimeZone, 'Unknown time zone (use an IANA name such as Europe/Berlin)'),
  elevationM: ranged(-450, 6000, 'm', 'Elevation').nullable(),
  latitude: ranged(-90, 90, '°', 'Latitude').nullable().default(null),
  longitude: ranged(-180, 180, '°', 'Longitude').nullable().default(null),
  defaultProfileId: uuid('defaultProfileId').nullable().default(null),
  safetyNote: text(20000).default(''),
  moistureCalibration: moistureCalibrationSchema.default({ kind: 'topp' }),
  tempDepthCm: ranged(0, 200, 'cm', 'Temperature depth').default(5),
  /**
   * How far (cm) a soil temperature's depth may sit from tempDepthCm and still count in a visit's
   * mean; one further off is flagged soil-temp-off-depth and kept apart. Default ±1 cm, about the
   * placement accuracy of a hand-pushed thermometer (common practice). Results read it when built:
   * fluxes do not depend on it, so a change needs no recompute.
   */
  tempDepthToleranceCm: ranged(0, 10, 'cm', 'Temperature depth tolerance').default(1),
  // Collars disturb the soil: common practice is to wait ≥ 1 day after install, better a week.
  settlingDaysHard: ranged(0, 365, 'days', 'Settling days').default(1),
  settlingDaysWarn: ranged(0, 365, 'days', 'Settling warning days').default(7),
  offsetSpreadPct: ranged(0, 100, '%', 'Offset spread').default(3),
  offsetMoveCm: ranged(0, 30, 'cm', 'Offset move').default(1),
  leakSlopeUmolMolS: ranged(0, 100, 'µmol/mol/s', 'Leak-check slope').default(0.05),
  ambientMarginPpm: ranged(0, 5000, 'µmol/mol', 'Start-above-ambient margin').default(100),
  /**
   * Chamber air temperature used when neither the analyzer file nor the visit has one (flagged
   * temp-site-default). Default 15 °C: US Standard Atmosphere 1976 sea level (shared/flux/chamber-air-temperature.ts).
   */
  defaultAirTempC: ranged(-40, 60, '°C', 'Default air temperature').default(15),
  /**
   * Where a curved model's flux takes its slope: at chamber closure (t = 0, the undisturbed flux,
   * Kutzbach et al. 2007) or at the end of the settle time. Closure unless the site chooses otherwise.
   */
  slopeBasis: z.enum(['closure', 'settle_end'], { message: 'Slope basis must be closure or settle_end' }).default('closure'),
  calibrationDriftLimitPct: ranged(0.1, 50, '%', 'Calibration drift limit').default(DEFAULT_CALIBRATION_DRIFT_LIMIT_PCT),
  digestLocalTime: z
    .string()
    .regex(/^([01]\d|2[0-3]):[0-5]\d$/, 'Digest time must be HH:MM')
    .default('18:00'),
  tileUrl: z
    .string()
    .max(500)
    .regex(/^https:\/\/.*\{z\}.*\{x\}.*\{y\}/, 'Tile URL must be https with {z}, {x} and {y}')
    .nullable()
    .default(null),
  tileAttribution: text(500).nullable().default(null),
});

/** A site's probe depth and depth tolerance, the schema defaults filling what a record lacks (e.g. a copy stored before the field). */
export const siteProbeDepth = siteFields.pick({ tempDepthCm: true, tempDepthToleranceCm: true });

export const blockFields = z.object({
  siteId: uuid('siteId'),
  code: name('block code'),
  name: text(200).default(''),
});

export const TREATMENT_LEVELS = ['plot', 'collar'] as const;
export const treatmentFields = z.object({
  siteId: uuid('siteId'),
  code: name('treatment code'),
  name: text(200).default(''),
  /** Whether the treatment is applied to whole plots or to single collars (e.g. trenched vs untrenched). */
  level: z.enum(TREATMENT_LEVELS),
  description: text(2000).default(''),
});

export const plotFields = z.object({
  siteId: uuid('siteId'),
  code: name('plot code'),
  blockId: uuid('blockId').nullable().default(null),
  treatmentId: uuid('treatmentId').nullable().default(null),
  /** GeoJSON Polygon geometry in WGS84, or a plain local layout. */
  outline: z
    .object({ type: z.literal('Polygon'), coordinates: z.array(z.array(z.tuple([z.number(), z.number()]))).min(1) })
    // A linear ring is closed and has at least four positions (RFC 7946 §3.1.6).
    .refine(
      (g) =>
        g.coordinates.every(
          (ring) => ring.length >= 4 && ring[0][0] === ring[ring.length - 1][0] && ring[0][1] === ring[ring.length - 1][1],
        ),
      { message: 'Each ring of the outline must be closed (last corner = first) with at least four positions', path: ['coordinates'] },
    )
    .nullable()
    .default(null),
});

export const chamberProfileFields = z.object({
  siteId: uuid('siteId'),
  name: name('profile name'),
  /** A new version (a new record) whenever tubing or chamber changes; never an edit. */
  validFrom: isoDate('validFrom'),
  chamberVolumeCm3: ranged(10, 1e6, 'cm³', 'Chamber volume'),
  loopVolumeCm3: ranged(0, 1e5, 'cm³', 'Loop volume'),
  // Common practice: discard roughly the first 20 s while the headspace mixes (no published constant).
  settleS: ranged(0, 600, 's', 'Settle time').default(20),
  closureLengthS: ranged(10, 7200, 's', 'Closure length').default(120),
  footprintAreaCm2: ranged(1, 1e5, 'cm²', 'Footprint area').nullable().default(null),
});

export const analyzerFields = z.object({
  siteId: uuid('siteId'),
  name: name('analyzer name'),
  serial: text(100).default(''),
  rangeMinPpm: ranged(0, 20000, 'µmol/mol', 'Calibrated range minimum').default(0),
  rangeMaxPpm: ranged(0, 20000, 'µmol/mol', 'Calibrated range maximum').default(5000),
  /** The maker's stated precision; null when unknown (the flux engine then uses 1 µmol/mol and says it is a default). */
  precisionPpm: ranged(0, 100, 'µmol/mol', 'Precision').nullable().default(null),
  calibrationIntervalDays: ranged(1, 3650, 'days', 'Calibration interval').default(365),
});

export const ANALYZER_CHECK_KINDS = ['calibration', 'leak', 'ambient', 'clock', 'warm-up', 'safety-ack'] as const;
const reading = (what: string) => ranged(-5000, 20000, 'µmol/mol', what).nullable().default(null);
const cylinder = (what: string) => z.string().trim().max(100, `${what}: at most 100 characters`).nullable().default(null);

export const analyzerCheckFields = z
  .object({
    siteId: uuid('siteId'),
    analyzerId: uuid('analyzerId').nullable().default(null),
    kind: z.enum(ANALYZER_CHECK_KINDS),
    at: z.string().datetime({ offset: true, message: 'at must be an ISO-8601 date-time' }),
    skipped: z.boolean().default(false),
    skipReason: text(500).nullable().default(null),
    passed: z.boolean().nullable().default(null),
    co2Ppm: ranged(0, 20000, 'µmol/mol', 'CO2').nullable().default(null),
    slopeUmolMolS: ranged(-1000, 1000, 'µmol/mol/s', 'Slope').nullable().default(null),
    clockOffsetS: ranged(-86400, 86400, 's', 'Clock offset').nullable().default(null),
    /** Calibration: the zero gas (scrubbed air or a cylinder) and the analyzer's readings before and after adjustment. */
    zeroGasPpm: ranged(0, 20000, 'µmol/mol', 'Zero gas').nullable().default(null),
    zeroCylinder: cylinder('Zero gas cylinder'),
    zeroBeforePpm: reading('Zero reading before'),
    zeroAfterPpm: reading('Zero reading after'),
    /** Calibration: the span gas cylinder's certified concentration, its id and the readings before and after. */
    spanGasPpm: ranged(0, 20000, 'µmol/mol', 'Span gas').nullable().default(null),
    spanCylinder: cylinder('Span gas cylinder'),
    spanBeforePpm: reading('Span reading before'),
    spanAfterPpm: reading('Span reading after'),
    /** As-found drift, reading before − gas (shared/model/calibration.ts); computed whenever the readings are given. */
    zeroDriftPpm: ranged(-5000, 5000, 'µmol/mol', 'Zero drift').nullable().default(null),
    driftPpm: ranged(-5000, 5000, 'µmol/mol', 'Drift').nullable().default(null),
    note: text(2000).default(''),
  })
  .superRefine((c, ctx) => {
    if (c.skipped && !(c.skipReason ?? '').trim())
      ctx.addIssue({ code: 'custom', message: 'A skipped check needs a reason', path: ['skipReason'] });
    if (c.kind !== 'calibration' || c.skipped) return;
    if (c.spanGasPpm !== null && c.spanGasPpm <= 0)
      ctx.addIssue({ code: 'custom', message: 'The span gas concentration must be above 0 µmol/mol', path: ['spanGasPpm'] });
    if (c.spanGasPpm !== null && c.zeroGasPpm !== null && c.spanGasPpm <= c.zeroGasPpm) {
      ctx.addIssue({ code: 'custom', message: 'The span gas must be above the zero gas', path: ['spanGasPpm'] });
    }
    for (const [gas, before, after] of [
      ['zeroGasPpm', 'zeroBeforePpm', 'zeroAfterPpm'],
      ['spanGasPpm', 'spanBeforePpm', 'spanAfterPpm'],
    ] as const) {
      if (c[gas] === null && (c[before] !== null || c[after] !== null)) {
        ctx.addIssue({
          code: 'custom',
          message: `Give the ${gas.startsWith('zero') ? 'zero' : 'span'} gas concentration its readings were taken on`,
          path: [gas],
        });
      }
    }
  })
  .transform((c) => {
    if (c.kind !== 'calibration') return c;
    const d = calibrationDrifts(c);
    return { ...c, zeroDriftPpm: d.zeroDriftPpm ?? c.zeroDriftPpm, driftPpm: d.driftPpm ?? c.driftPpm };
  });

function isTimeZone(tz: string): boolean {
  try {
    new Intl.DateTimeFormat('en', { timeZone: tz });
    return true;
  } catch {
    return false;
  }
}

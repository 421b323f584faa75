import { DEMO_SITE_ID } from './demo-accounts';
import type { PlotClimate } from './demo-climate';
import { createOp, updateOp, type SeedWrite } from './demo-plan';
import { demoId, Rng } from './prng';

/**
 * The invented experiment at Alder Hollow Field Station: a randomised complete block design,
 * 4 blocks × 3 plot treatments, 4 round collars per plot, and a trenched/untrenched collar pair
 * inside every control plot. Positions use a plain local layout near 51.0 °N, 10.0 °E.
 */

export const SITE_LAT = 51.0;
export const SITE_LON = 10.0;
// Metres per degree near 51° N on a sphere of mean radius (plain geometry; fine over 60 m).
const M_PER_DEG_LAT = 111_320;
const M_PER_DEG_LON = 111_320 * Math.cos((SITE_LAT * Math.PI) / 180);

export const PLOT_TREATMENTS = [
  {
    code: 'CTL',
    name: 'Control',
    description: 'Undisturbed grassland–scrub edge, no manipulation.',
    r10: 2.3,
    climate: { offsetC: 0, dailyAmplitudeFactor: 1 },
  },
  {
    code: 'WRM',
    name: 'Soil warming',
    description: 'Buried heating cables hold the soil at 5 cm about 1.8 °C above the control plots.',
    r10: 2.2,
    climate: { offsetC: 1.8, dailyAmplitudeFactor: 1 },
  },
  {
    code: 'LRM',
    name: 'Litter removal',
    description: 'Fresh litter raked off monthly since the previous autumn.',
    r10: 1.7,
    climate: { offsetC: 0.2, dailyAmplitudeFactor: 1.35 },
  },
] as const;
export type PlotTreatmentCode = (typeof PLOT_TREATMENTS)[number]['code'];

export const COLLAR_TREATMENTS = [
  {
    code: 'TRN',
    name: 'Trenched',
    description: 'Roots cut by a 40 cm trench lined with root fabric around the collar: heterotrophic respiration only.',
    factor: 0.62,
  },
  { code: 'UTR', name: 'Untrenched', description: 'Companion collar of the trenched pair, roots intact.', factor: 1 },
] as const;

export const DEMO_Q10 = 2.2;
export const COLLAR_DIAMETER_CM = 20;
export const COLLAR_HEIGHT_CM = 8;

export interface DemoCollar {
  id: string;
  code: string;
  plotId: string;
  plotCode: string;
  blockIndex: number;
  treatment: PlotTreatmentCode;
  collarTreatment: 'TRN' | 'UTR' | null;
  installedOn: string;
  /** Hidden "truth" the season is generated from. */
  baseOffsetCm: number;
  respirationFactor: number;
  r10: number;
  vwcOffsetPct: number;
  climate: PlotClimate;
}

export interface DemoProfile {
  id: string;
  validFrom: string;
  chamberVolumeCm3: number;
  loopVolumeCm3: number;
  settleS: number;
  closureLengthS: number;
}

export interface DemoLayout {
  writes: SeedWrite[];
  collars: DemoCollar[];
  routes: { id: string; name: string; collarIds: string[] }[];
  profiles: DemoProfile[];
  analyzerId: string;
}

const round = (x: number, d: number) => Math.round(x * 10 ** d) / 10 ** d;
const toLonLat = (xM: number, yM: number): [number, number] => [
  round(SITE_LON + xM / M_PER_DEG_LON, 7),
  round(SITE_LAT + yM / M_PER_DEG_LAT, 7),
];

export const PROFILES: DemoProfile[] = [
  // Settle time 20 s and a 120 s closure are common practice for small dark chambers.
  { id: demoId('profile:v1'), validFrom: '2026-03-01', chamberVolumeCm3: 4000, loopVolumeCm3: 150, settleS: 20, closureLengthS: 120 },
  // Mid-season the analyzer tubing was replaced with longer lines: a new version, never an edit.
  { id: demoId('profile:v2'), validFrom: '2026-07-01', chamberVolumeCm3: 4000, loopVolumeCm3: 185, settleS: 20, closureLengthS: 120 },
];

export function buildLayout(seed = 20260401): DemoLayout {
  const rng = new Rng(seed);
  const writes: SeedWrite[] = [];
  const site = DEMO_SITE_ID;
  const treatmentId = (code: string) => demoId(`treatment:${code}`);

  for (const t of PLOT_TREATMENTS) {
    writes.push(
      createOp('treatment', treatmentId(t.code), 'admin', {
        siteId: site,
        code: t.code,
        name: t.name,
        level: 'plot',
        description: t.description,
      }),
    );
  }
  for (const t of COLLAR_TREATMENTS) {
    writes.push(
      createOp('treatment', treatmentId(t.code), 'admin', {
        siteId: site,
        code: t.code,
        name: t.name,
        level: 'collar',
        description: t.description,
      }),
    );
  }
  for (const p of PROFILES) {
    writes.push(
      createOp('chamberProfile', p.id, 'admin', {
        siteId: site,
        name: 'Dark chamber 20 cm',
        validFrom: p.validFrom,
        chamberVolumeCm3: p.chamberVolumeCm3,
        loopVolumeCm3: p.loopVolumeCm3,
        settleS: p.settleS,
        closureLengthS: p.closureLengthS,
        footprintAreaCm2: null,
      }),
    );
  }
  writes.push(updateOp('site', site, 'admin', { defaultProfileId: PROFILES[0].id }));
  const analyzerId = demoId('analyzer:A1');
  writes.push(
    createOp('analyzer', analyzerId, 'admin', {
      siteId: site,
      name: 'Analyzer A1',
      serial: 'AH-0713-2291',
      rangeMinPpm: 0,
      rangeMaxPpm: 3000,
      precisionPpm: 1,
      calibrationIntervalDays: 180,
    }),
  );

  const collars: DemoCollar[] = [];
  for (let b = 0; b < 4; b++) {
    const blockId = demoId(`block:B${b + 1}`);
    writes.push(createOp('block', blockId, 'admin', { siteId: site, code: `B${b + 1}`, name: `Block ${b + 1}` }));
    // Randomised complete blocks: each treatment once per block, in a seeded random order.
    const order = rng.shuffle(PLOT_TREATMENTS);
    for (let p = 0; p < 3; p++) {
      const t = order[p];
      const plotCode = `P${String(b * 3 + p + 1).padStart(2, '0')}`;
      const plotId = demoId(`plot:${plotCode}`);
      // 10 m × 10 m plots, 4 m apart; blocks run west → east, plots south → north.
      const x0 = b * 14;
      const y0 = p * 14;
      const ring = [
        [0, 0],
        [10, 0],
        [10, 10],
        [0, 10],
        [0, 0],
      ].map(([dx, dy]) => toLonLat(x0 + dx, y0 + dy));
      writes.push(
        createOp('plot', plotId, 'admin', {
          siteId: site,
          code: plotCode,
          blockId,
          treatmentId: treatmentId(t.code),
          outline: { type: 'Polygon', coordinates: [ring] },
        }),
      );
      const plotClimate: PlotClimate = {
        offsetC: t.climate.offsetC + rng.normal(0, 0.25),
        dailyAmplitudeFactor: t.climate.dailyAmplitudeFactor,
      };
      const plotVwc = rng.normal(0, 2);
      const corners = [
        [2.5, 2.5],
        [7.5, 2.5],
        [7.5, 7.5],
        [2.5, 7.5],
      ];
      for (let c = 0; c < 4; c++) {
        const code = `B${b + 1}-${plotCode}-C${c + 1}`;
        const collarTreatment = t.code === 'CTL' ? (c < 2 ? 'TRN' : 'UTR') : null;
        const [lon, lat] = toLonLat(x0 + corners[c][0] + rng.uniform(-0.4, 0.4), y0 + corners[c][1] + rng.uniform(-0.4, 0.4));
        const insertion = round(rng.uniform(5, 6.5), 1);
        const installedOn = b < 2 ? '2026-03-24' : '2026-03-25';
        collars.push({
          id: demoId(`collar:${code}`),
          code,
          plotId,
          plotCode,
          blockIndex: b,
          treatment: t.code,
          collarTreatment,
          installedOn,
          baseOffsetCm: COLLAR_HEIGHT_CM - insertion + rng.normal(0, 0.15),
          respirationFactor: Math.exp(rng.normal(0, 0.18)) * (collarTreatment === 'TRN' ? COLLAR_TREATMENTS[0].factor : 1),
          r10: t.r10,
          vwcOffsetPct: plotVwc + rng.normal(0, 1.2),
          climate: plotClimate,
        });
        writes.push(
          createOp('collar', demoId(`collar:${code}`), 'crew', {
            siteId: site,
            code,
            plotId,
            treatmentId: collarTreatment ? treatmentId(collarTreatment) : null,
            latitude: lat,
            longitude: lon,
            accuracyM: round(rng.uniform(2.5, 5), 1),
            shape: 'round',
            diameterCm: COLLAR_DIAMETER_CM,
            sideACm: null,
            sideBCm: null,
            heightCm: COLLAR_HEIGHT_CM,
            insertionCm: insertion,
            installedOn,
            notes: collarTreatment === 'TRN' ? 'Trenched 2025-10: root fabric to 40 cm.' : '',
            status: 'active',
            statusReason: null,
          }),
        );
        writes.push(
          createOp('collarEvent', demoId(`event:install:${code}`), 'crew', {
            siteId: site,
            collarId: demoId(`collar:${code}`),
            kind: 'installed',
            date: installedOn,
            note: 'Driven in with a board and mallet after the buried-services check.',
            replacedById: null,
          }),
        );
      }
    }
  }

  const byBlock = (blocks: number[]) =>
    blocks.flatMap((b, i) => {
      // Walk the plots of alternate blocks in opposite directions (a serpentine walk).
      const plots = [0, 1, 2].map((p) =>
        collars.filter((c) => c.blockIndex === b && c.plotCode === `P${String(b * 3 + p + 1).padStart(2, '0')}`),
      );
      return (i % 2 === 0 ? plots : plots.reverse()).flat().map((c) => c.id);
    });
  const routes = [
    { id: demoId('route:west'), name: 'West loop (blocks 1–2)', collarIds: byBlock([0, 1]) },
    { id: demoId('route:east'), name: 'East loop (blocks 3–4)', collarIds: byBlock([2, 3]) },
  ];
  for (const r of routes) writes.push(createOp('route', r.id, 'lead', { siteId: site, name: r.name, collarIds: r.collarIds }));
  return { writes, collars, routes, profiles: PROFILES, analyzerId };
}

export function collarByCode(layout: DemoLayout, code: string): DemoCollar {
  const c = layout.collars.find((x) => x.code === code);
  if (!c) throw new Error(`no demo collar ${code}`);
  return c;
}

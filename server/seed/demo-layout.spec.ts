import { ENTITY_FIELDS } from '../../shared/model/entities';
import { buildLayout, SITE_LAT, SITE_LON } from './demo-layout';

describe('demo layout', () => {
  const layout = buildLayout();
  const creates = (entity: string) => layout.writes.filter((w) => w.entity === entity && w.kind === 'create');

  it('when built twice, then it is the same layout (seeded)', () => {
    expect(buildLayout()).toEqual(layout);
  });

  it('when each create is checked against the shared schemas, then all pass', () => {
    const bad = layout.writes.filter((w) => w.kind === 'create' && !ENTITY_FIELDS[w.entity].safeParse(w.fields).success);
    expect(bad.map((w) => `${w.entity}:${w.id}`)).toEqual([]);
  });

  it('when plots are counted per block, then every block has each of the 3 plot treatments once (complete blocks)', () => {
    const plots = creates('plot').map((w) => w.fields as { blockId: string; treatmentId: string });
    expect(plots).toHaveLength(12);
    const blocks = new Set(plots.map((p) => p.blockId));
    expect(blocks.size).toBe(4);
    for (const b of blocks) expect(new Set(plots.filter((p) => p.blockId === b).map((p) => p.treatmentId)).size).toBe(3);
  });

  it('when collars are listed, then there are 48 unique codes, 4 per plot, each inside its plot outline', () => {
    const collars = creates('collar').map((w) => w.fields as { code: string; plotId: string; latitude: number; longitude: number });
    expect(new Set(collars.map((c) => c.code)).size).toBe(48);
    const outlines = new Map(
      creates('plot').map((w) => [w.id, (w.fields as { outline: { coordinates: [number, number][][] } }).outline.coordinates[0]]),
    );
    for (const c of collars) {
      const ring = outlines.get(c.plotId)!;
      const lons = ring.map((p) => p[0]);
      const lats = ring.map((p) => p[1]);
      expect(c.longitude).toBeGreaterThan(Math.min(...lons));
      expect(c.longitude).toBeLessThan(Math.max(...lons));
      expect(c.latitude).toBeGreaterThan(Math.min(...lats));
      expect(c.latitude).toBeLessThan(Math.max(...lats));
    }
    expect(collars.filter((c) => c.plotId === collars[0].plotId)).toHaveLength(4);
  });

  it('when the plot outlines are measured, then they are closed 10 m squares within 100 m of 51.0 °N 10.0 °E', () => {
    const ring = (creates('plot')[5].fields as { outline: { coordinates: [number, number][][] } }).outline.coordinates[0];
    expect(ring[0]).toEqual(ring[4]);
    // 1° of latitude ≈ 111.32 km; 1° of longitude ≈ 111.32 km · cos φ (spherical Earth, plain geometry).
    const widthM = (ring[1][0] - ring[0][0]) * 111_320 * Math.cos((SITE_LAT * Math.PI) / 180);
    const heightM = (ring[2][1] - ring[1][1]) * 111_320;
    expect(widthM).toBeCloseTo(10, 1);
    expect(heightM).toBeCloseTo(10, 1);
    for (const [lon, lat] of ring) {
      expect(Math.abs(lat - SITE_LAT) * 111_320).toBeLessThan(100);
      expect(Math.abs(lon - SITE_LON) * 70_000).toBeLessThan(100);
    }
  });

  it('when offsets are derived from height and insertion, then they lie between 1 and 4 cm', () => {
    for (const c of layout.collars) {
      expect(c.baseOffsetCm).toBeGreaterThan(1);
      expect(c.baseOffsetCm).toBeLessThan(4);
    }
  });

  it('when routes are listed, then two routes of 24 cover every collar once, each walking whole plots in turn', () => {
    expect(layout.routes.map((r) => r.collarIds.length)).toEqual([24, 24]);
    expect(new Set(layout.routes.flatMap((r) => r.collarIds)).size).toBe(48);
    const plotOf = new Map(layout.collars.map((c) => [c.id, c.plotCode]));
    const visits = layout.routes[0].collarIds.map((id) => plotOf.get(id));
    const runs = visits.filter((p, i) => i === 0 || p !== visits[i - 1]);
    expect(runs).toHaveLength(6);
  });

  it('when collar treatments are listed, then only control plots carry trenched/untrenched pairs', () => {
    const trenched = layout.collars.filter((c) => c.collarTreatment);
    expect(trenched).toHaveLength(16);
    expect(new Set(trenched.map((c) => c.treatment))).toEqual(new Set(['CTL']));
    expect(trenched.filter((c) => c.collarTreatment === 'TRN')).toHaveLength(8);
  });
});

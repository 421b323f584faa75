import { fitLloydTaylor, fitQ10 } from '../../shared/flux';
import { DEMO_SITE_ID } from '../support/fixtures';
import { demoEmail, signIn, startTestApp, type Session, type TestApp } from '../support/test-app';
import { handTreatmentMeans, type HandRow } from './results-hand-calculation';

async function seededRows(t: TestApp, states: string[]): Promise<HandRow[]> {
  const rows = await t.ds.query(
    `SELECT k.id, k.flux_umol_m2_s, k.visit_id, v.collar_id, v.campaign_id, c.plot_id, b.code AS block, pt.code AS pt, ct.code AS ct
       FROM closure k JOIN visit v ON v.id = k.visit_id JOIN collar c ON c.id = v.collar_id JOIN plot p ON p.id = c.plot_id
       LEFT JOIN block b ON b.id = p.block_id LEFT JOIN treatment pt ON pt.id = p.treatment_id LEFT JOIN treatment ct ON ct.id = c.treatment_id
      WHERE k.site_id = $1 AND NOT k.deleted AND NOT v.skipped AND k.flux_umol_m2_s IS NOT NULL AND k.review_state = ANY($2)`, [DEMO_SITE_ID, states]);
  return rows.map((r: any) => ({ closureId: r.id, flux: r.flux_umol_m2_s, visitId: r.visit_id, collarId: r.collar_id, campaignId: r.campaign_id,
    plotId: r.plot_id, blockCode: r.block, plotTreatment: r.pt, collarTreatment: r.ct }));
}

describe('Bench results: aggregation, responses and seasonal totals on the seeded season', () => {
  let t: TestApp;
  let lab: Session, crew: Session, lead: Session;
  beforeAll(async () => {
    t = await startTestApp();
    [lab, crew, lead] = await Promise.all((['lab', 'crew', 'lead'] as const).map((r) => signIn(t.app, demoEmail(r))));
  });
  afterAll(() => t.close());

  it('when the lab reads the treatment summary, then every cell mean, SE and n matches the hand calculation over plots', async () => {
    const res = await lab.get(`/api/results/summary?siteId=${DEMO_SITE_ID}`);
    expect(res.status).toBe(200);
    const hand = handTreatmentMeans(await seededRows(t, ['accepted']));
    expect(hand.size).toBeGreaterThan(0);
    expect(res.body.cellMeans).toHaveLength(hand.size);
    for (const m of res.body.cellMeans) {
      const h = hand.get(`${m.campaignId}|${m.cellKey}`)!;
      expect([m.cellKey, m.nPlots, m.nCollars]).toEqual([m.cellKey, h.nPlots, h.nCollars]);
      expect(m.meanUmolM2S).toBeCloseTo(h.mean, 10);
      if (h.se === null) expect(m.seUmolM2S).toBeNull();
      else expect(m.seUmolM2S).toBeCloseTo(h.se, 10);
    }
  });

  it('when trenched and untrenched collars share the control plots, then each is replicated by the 4 plots, not by its 8 collars', async () => {
    // April is fully reviewed in the seed: every control plot has two trenched and two untrenched collars.
    const res = await lab.get(`/api/results/summary?siteId=${DEMO_SITE_ID}&closures=not-rejected`);
    const april = res.body.campaigns.find((c: { name: string }) => c.name === 'April 2026 survey').campaignId;
    const trn = res.body.cellMeans.find((m: any) => m.campaignId === april && m.cellKey === 'CTL|TRN');
    const hand = handTreatmentMeans(await seededRows(t, ['accepted', 'unreviewed'])).get(`${april}|CTL|TRN`)!;
    expect(trn.nPlots).toBe(4);
    expect(trn.nCollars).toBe(hand.nCollars);
    expect(trn.nCollars).toBeGreaterThan(trn.nPlots);
    expect(trn.meanUmolM2S).toBeCloseTo(hand.mean, 10);
    expect(trn.seUmolM2S).toBeCloseTo(hand.se!, 10);
    // The invented season makes trenched collars respire ~62 % of their untrenched neighbours.
    const utr = res.body.cellMeans.find((m: any) => m.campaignId === april && m.cellKey === 'CTL|UTR');
    expect(trn.meanUmolM2S).toBeLessThan(utr.meanUmolM2S);
    const stratum = res.body.blockStrata.find((s: any) => s.campaignId === april && s.stratum === 'collar-level within CTL');
    expect(stratum).toMatchObject({ cellKeys: ['CTL|TRN', 'CTL|UTR'], blockCodes: ['B1', 'B2', 'B3', 'B4'], dfResidual: 3 });
    expect(trn.seBlockUmolM2S).toBeCloseTo(Math.sqrt(stratum.msResidual / 4), 12);
  });

  it('when responses are read, then each cell carries the engine\'s Q10 and Lloyd & Taylor fits of its own points', async () => {
    const res = await lab.get(`/api/results/responses?siteId=${DEMO_SITE_ID}&closures=not-rejected`);
    expect(res.status).toBe(200);
    expect(res.body.tempDepthCm).toBe(5);
    for (const r of res.body.responses) {
      const temps = r.points.map((p: any) => p.tempC);
      const flux = r.points.map((p: any) => p.fluxUmolM2S);
      expect(r.q10).toEqual(JSON.parse(JSON.stringify(fitQ10(temps, flux))));
      expect(r.lloydTaylor).toEqual(JSON.parse(JSON.stringify(fitLloydTaylor(temps, flux))));
    }
    const wrm = res.body.responses.find((r: any) => r.cellKey === 'WRM|none');
    expect(wrm.q10.ok).toBe(true);
    // The invented season is generated with Q10 = 2.2 (server/seed/demo-layout.ts); the fit on visit means brackets it.
    expect(wrm.q10.q10.ciLow).toBeLessThan(2.2);
    expect(wrm.q10.q10.ciHigh).toBeGreaterThan(2.2);
    expect(wrm.points.every((p: any) => typeof p.vwcPct === 'number')).toBe(true);
  });

  it('when seasonal totals are read twice, then they are reproducible, logged days are used where logs exist, and the cumulative ends at the total', async () => {
    const q = `/api/results/seasonal?siteId=${DEMO_SITE_ID}&closures=not-rejected&from=2026-04-14&to=2026-10-14&resamples=1000&seed=5`;
    const [a, b] = [await lab.get(q), await lab.get(q)];
    expect(a.status).toBe(200);
    expect(a.body.totals).toEqual(b.body.totals);
    expect(a.body).toMatchObject({ fromDay: '2026-04-14', toDay: '2026-10-14', model: 'lloyd-taylor' });
    const days = 184;
    for (const c of a.body.totals) {
      expect(c.ciLowGCM2).toBeLessThanOrEqual(c.totalGCM2);
      expect(c.ciHighGCM2).toBeGreaterThanOrEqual(c.totalGCM2);
      expect(c.cumulative).toHaveLength(days);
      expect(c.cumulative.at(-1).gCM2).toBeCloseTo(c.totalGCM2, 8);
      for (const p of c.plots) expect(p.days).toEqual({ logged: days, interpolated: 0, missing: 0 });
    }
    const ctl = a.body.totals.find((c: any) => c.cellKey === 'CTL|UTR');
    expect(ctl.nPlots).toBe(4);
    // A plausible temperate-season range for soil CO2 efflux (hundreds of g C m⁻²; common knowledge, order of magnitude only).
    expect(ctl.totalGCM2).toBeGreaterThan(100);
    expect(ctl.totalGCM2).toBeLessThan(1500);
    // Before the first campaign the logs still carry the fitted response (1 April–31 October, local days); after the
    // logs end, days are interpolated up to a plot's December visit where it has one, else reported missing — never zero.
    const wide = await lab.get(`/api/results/seasonal?siteId=${DEMO_SITE_ID}&closures=not-rejected&from=2026-04-01`);
    expect(wide.body.toDay).toBe('2026-12-04');
    for (const c of wide.body.totals) {
      for (const p of c.plots) {
        expect(p.days.logged).toBe(214);
        expect(p.days.interpolated + p.days.missing).toBe(34);
      }
    }
  });

  it('when crew or a lead ask for results, then they are refused', async () => {
    for (const s of [crew, lead]) expect((await s.get(`/api/results/summary?siteId=${DEMO_SITE_ID}`)).status).toBe(403);
    expect((await lab.get(`/api/results/seasonal?siteId=${DEMO_SITE_ID}&from=2026-05-01&to=2026-04-01`)).status).toBe(400);
  });
});

import { fitQ10 } from '../../shared/flux';
import { DEMO_SITE_ID } from '../support/fixtures';
import { demoEmail, signIn, startTestApp, type Session, type TestApp } from '../support/test-app';
import { handTreatmentMeans, type HandRow } from './results-hand-calculation';

async function seededRows(t: TestApp, states: string[]): Promise<HandRow[]> {
  const rows = await t.ds.query(
    `SELECT k.id, k.flux_umol_m2_s, k.visit_id, v.collar_id, v.campaign_id, c.plot_id, b.code AS block, pt.code AS pt, ct.code AS ct
       FROM closure k JOIN visit v ON v.id = k.visit_id JOIN collar c ON c.id = v.collar_id JOIN plot p ON p.id = c.plot_id
       LEFT JOIN block b ON b.id = p.block_id LEFT JOIN treatment pt ON pt.id = p.treatment_id LEFT JOIN treatment ct ON ct.id = c.treatment_id
      WHERE k.site_id = $1 AND NOT k.deleted AND NOT v.skipped AND k.flux_umol_m2_s IS NOT NULL AND k.review_state = ANY($2)`,
    [DEMO_SITE_ID, states],
  );
  return rows.map((r: any) => ({
    closureId: r.id,
    flux: r.flux_umol_m2_s,
    visitId: r.visit_id,
    collarId: r.collar_id,
    campaignId: r.campaign_id,
    plotId: r.plot_id,
    blockCode: r.block,
    plotTreatment: r.pt,
    collarTreatment: r.ct,
  }));
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
    // A split plot: trenched and untrenched collars share each plot, so the plot (not the block) pairs them.
    const ctlPlots = [
      ...new Set(res.body.plotMeans.filter((m: any) => m.campaignId === april && m.cellKey === 'CTL|TRN').map((m: any) => m.plotCode)),
    ].sort();
    expect(stratum).toMatchObject({ factor: 'plot', cellKeys: ['CTL|TRN', 'CTL|UTR'], blockCodes: ctlPlots, dfResidual: 3 });
    expect(trn.seBlockUmolM2S).toBeCloseTo(Math.sqrt(stratum.msResidual / 4), 12);
  });

  it('when responses are read, then each cell is fitted on plot × campaign × round means (the experimental unit), not on visits', async () => {
    const res = await lab.get(`/api/results/responses?siteId=${DEMO_SITE_ID}&closures=not-rejected`);
    expect(res.status).toBe(200);
    expect(res.body.tempDepthCm).toBe(5);
    const summary = await lab.get(`/api/results/summary?siteId=${DEMO_SITE_ID}&closures=not-rejected`);
    for (const r of res.body.responses) {
      const temps = r.points.map((p: any) => p.tempC);
      const flux = r.points.map((p: any) => p.fluxUmolM2S);
      const units = new Set(r.points.map((p: any) => `${p.plotId}|${p.campaignId}|${p.round}`));
      expect(units.size).toBe(r.points.length);
      const { warnings: _w, ...engine } = fitQ10(temps, flux) as any;
      expect(r.q10).toMatchObject(JSON.parse(JSON.stringify(engine)));
      expect(r.lloydTaylor.n ?? r.points.length).toBe(r.points.length);
      expect(r.nPlots).toBe(new Set(r.points.map((p: any) => p.plotId)).size);
      // Far fewer units than visit means: the repeated collars of a plot are one unit per round.
      const plotRounds = summary.body.plotMeans.filter((m: any) => m.cellKey === r.cellKey).length;
      expect(r.points.length).toBeLessThanOrEqual(plotRounds * 2);
      expect(r.points.some((p: any) => p.nVisits > 1)).toBe(true);
      expect(r.q10Log.ok).toBe(true);
    }
    const wrm = res.body.responses.find((r: any) => r.cellKey === 'WRM|none');
    expect(wrm.q10.ok).toBe(true);
    // The invented season is generated with Q10 = 2.2 (server/seed/demo-layout.ts); the fit on plot-round means brackets it.
    expect(wrm.q10.q10.ciLow).toBeLessThan(2.2);
    expect(wrm.q10.q10.ciHigh).toBeGreaterThan(2.2);
    expect(wrm.q10Log.q10.ciLow).toBeLessThan(2.2);
    expect(wrm.q10Log.q10.ciHigh).toBeGreaterThan(2.2);
    expect(wrm.points.every((p: any) => typeof p.vwcPct === 'number')).toBe(true);
  });

  it('when seasonal totals are read twice, then they are reproducible, logged days are used where logs exist, and the cumulative ends at the total', async () => {
    const q = `/api/results/seasonal?siteId=${DEMO_SITE_ID}&closures=not-rejected&from=2026-04-15&to=2026-10-14`;
    const [a, b] = [await lab.get(q), await lab.get(q)];
    expect(a.status).toBe(200);
    expect(a.body.totals).toEqual(b.body.totals);
    expect(a.body).toMatchObject({ fromDay: '2026-04-15', toDay: '2026-10-14', model: 'lloyd-taylor' });
    expect(a.body.interval).toContain('leaves out the uncertainty of the response parameters and of the gap filling');
    const days = 183;
    for (const c of a.body.totals) {
      expect(c.status).toBe('complete');
      expect(c.ciLowGCM2).toBeLessThanOrEqual(c.totalGCM2);
      expect(c.ciHighGCM2).toBeGreaterThanOrEqual(c.totalGCM2);
      expect(c.cumulative).toHaveLength(days);
      expect(c.cumulative.at(-1).gCM2).toBeCloseTo(c.totalGCM2, 8);
      for (const p of c.plots) {
        expect(p.days.logged + p.days.interpolated).toBe(days);
        expect(p.days.logged).toBeGreaterThan(150);
        expect(p).toMatchObject({ logDepthCm: 5, responseDepthCm: 5, depthDiffers: false });
      }
    }
    const ctl = a.body.totals.find((c: any) => c.cellKey === 'CTL|UTR');
    expect(ctl.nPlots).toBe(4);
    // A plausible temperate-season range for soil CO2 efflux (hundreds of g C m⁻²; common knowledge, order of magnitude only).
    expect(ctl.totalGCM2).toBeGreaterThan(100);
    expect(ctl.totalGCM2).toBeLessThan(1500);
    // After the logs end (31 October) days are interpolated up to a plot's December visit where it has one, else missing —
    // and then no total is given, never a smaller one; the response says where every plot has a value.
    const wide = await lab.get(`/api/results/seasonal?siteId=${DEMO_SITE_ID}&closures=not-rejected&from=2026-04-15&to=2026-12-04`);
    expect(wide.body.toDay).toBe('2026-12-04');
    for (const c of wide.body.totals) {
      for (const p of c.plots) expect(p.days.logged + p.days.interpolated + p.days.missing).toBe(234);
      if (c.plots.some((p: any) => p.days.missing)) expect(c).toMatchObject({ status: 'incomplete', totalGCM2: null, ciLowGCM2: null });
      else expect(c.totalGCM2).toBeGreaterThan(ctl.totalGCM2 / 2);
    }
    expect(wide.body.totals.some((c: any) => c.status === 'incomplete')).toBe(true);
    // Without a stated period, the season is the span in which every plot has a value.
    const auto = await lab.get(`/api/results/seasonal?siteId=${DEMO_SITE_ID}&closures=not-rejected`);
    expect(auto.body.totals.every((c: any) => c.status === 'complete')).toBe(true);
  });

  it("when a trenched plot's only accepted closures are flat near zero, then it is reported as too little signal, never a negative total", async () => {
    const res = await lab.get(`/api/results/seasonal?siteId=${DEMO_SITE_ID}&from=2026-04-15&to=2026-05-12`);
    expect(res.status).toBe(200);
    const trn = res.body.totals.find((c: any) => c.cellKey === 'CTL|TRN');
    const quiet = trn.plots.filter((p: any) => p.status === 'too little signal');
    expect(quiet.map((p: any) => p.plotCode)).toEqual(['P10']);
    expect(quiet[0].totalGCM2).toBeNull();
    for (const c of res.body.totals) {
      for (const p of c.plots) {
        if (p.scale !== null) expect(p.scale).toBeGreaterThan(0);
        if (p.totalGCM2 !== null) expect(p.totalGCM2).toBeGreaterThan(0);
      }
      if (c.totalGCM2 !== null) expect(c.totalGCM2).toBeGreaterThan(0);
    }
    expect(trn.flags[0]).toBe('1 of 4 plots have too little signal and are not totalled: P10');
  });

  it('when crew or a lead ask for results, then they are refused', async () => {
    for (const s of [crew, lead]) expect((await s.get(`/api/results/summary?siteId=${DEMO_SITE_ID}`)).status).toBe(403);
    expect((await lab.get(`/api/results/seasonal?siteId=${DEMO_SITE_ID}&from=2026-05-01&to=2026-04-01`)).status).toBe(400);
  });
});

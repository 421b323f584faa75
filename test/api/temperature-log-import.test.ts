import { DEMO_SITE_ID } from '../support/fixtures';
import { demoEmail, signIn, startTestApp, type Session, type TestApp } from '../support/test-app';

const URL = '/api/results/temperature-logs/import';
type Log = { id: string; plotId: string; depthCm: number; series: { t: string[]; tempC: number[] } };

/** The lab's run on the Bench: preview (dry run), import for two plots, then a second file over part of the period. */
describe('temperature log import from the Bench', () => {
  let t: TestApp;
  let lab: Session;
  let crew: Session;
  let plots: string[];
  const depthCm = 37; // a depth the demo site has no log at
  const logsAt = async (plotId: string): Promise<Log[]> =>
    ((await lab.get(`/api/temperature-logs?siteId=${DEMO_SITE_ID}&limit=500`)).body.items as Log[]).filter(
      (l) => l.plotId === plotId && l.depthCm === depthCm,
    );
  const hourly = (fromHour: number, n: number, temp: (i: number) => number) =>
    [
      'Zeit\tT_boden',
      ...Array.from({ length: n }, (_, i) => `2026-07-01 ${String(fromHour + i).padStart(2, '0')}:00\t${temp(i).toFixed(1)}`),
    ].join('\n');
  const body = (text: string, extra: object = {}) => ({
    siteId: DEMO_SITE_ID,
    plotIds: plots,
    depthCm,
    source: 'bench test',
    text,
    timeColumn: 'Zeit',
    tempColumn: 'T_boden',
    timeZone: 'Europe/Berlin',
    ...extra,
  });

  beforeAll(async () => {
    t = await startTestApp();
    [lab, crew] = await Promise.all((['lab', 'crew'] as const).map((r) => signIn(t.app, demoEmail(r))));
    plots = ((await lab.get(`/api/plots?siteId=${DEMO_SITE_ID}&limit=2`)).body.items as { id: string }[]).map((p) => p.id);
    expect(plots).toHaveLength(2);
  });
  afterAll(() => t.close());

  it('when the crew tries to import, then it is refused', async () => {
    expect((await crew.post(URL, body(hourly(0, 3, () => 10)))).status).toBe(403);
  });

  it('when no plot is chosen or the mode is unknown, then the refusal says what to choose', async () => {
    const none = await lab.post(
      URL,
      body(
        hourly(0, 3, () => 10),
        { plotIds: [] },
      ),
    );
    expect(none.status).toBe(400);
    expect(JSON.stringify(none.body.error)).toContain('Choose the plot(s) this log stands for');
    const mode = await lab.post(
      URL,
      body(
        hourly(0, 3, () => 10),
        { mode: 'merge' },
      ),
    );
    expect(mode.status).toBe(400);
    expect(mode.body.error.fields).toEqual([
      { path: 'mode', message: 'Choose "replace" or "append" for logs already stored for these plots' },
    ]);
  });

  it('when a line is bad, then every bad line is named and nothing is stored', async () => {
    const text = `${hourly(0, 2, () => 10)}\n2026-07-01 02:00\tn/a\n2026-07-01 25:00\t9.0`;
    const res = await lab.post(URL, body(text));
    expect(res.status).toBe(400);
    expect(res.body.error.fields.map((f: { message: string }) => f.message.slice(0, 7))).toEqual(['Line 4:', 'Line 5:']);
    expect(await logsAt(plots[0])).toEqual([]);
  });

  it('when the lab previews, imports for two plots, then replaces and appends over part of the period, then each plot holds one reading per hour', async () => {
    const preview = await lab.post(
      URL,
      body(
        hourly(0, 6, (i) => 10 + i),
        { dryRun: true },
      ),
    );
    expect(preview.status).toBe(201);
    expect(preview.body).toMatchObject({ dryRun: true, samples: 6, from: '2026-06-30T22:00:00.000Z', to: '2026-07-01T03:00:00.000Z' });
    expect(await logsAt(plots[0])).toEqual([]);

    const first = await lab.post(URL, body(hourly(0, 6, (i) => 10 + i)));
    expect(first.status).toBe(201);
    for (const p of plots) expect((await logsAt(p)).map((l) => l.series.tempC)).toEqual([[10, 11, 12, 13, 14, 15]]);

    // Hours 04..07 over a log that holds 00..05: replace drops the stored 04 and 05 and takes the file's.
    const replace = await lab.post(
      URL,
      body(
        hourly(4, 4, () => 20),
        { mode: 'replace' },
      ),
    );
    expect(replace.status).toBe(201);
    expect(replace.body.plots[0]).toMatchObject({ samples: 4, skipped: 0, replacedSamples: 2 });
    for (const p of plots) {
      const merged = (await logsAt(p)).flatMap((l) => l.series.t.map((at, i) => [at, l.series.tempC[i]] as const)).sort();
      expect(merged.map(([, v]) => v)).toEqual([10, 11, 12, 13, 20, 20, 20, 20]);
    }

    // Hours 06..09 appended over a period that now holds 00..07: stored 06 and 07 stay, 08 and 09 come in.
    const append = await lab.post(
      URL,
      body(
        hourly(6, 4, () => 30),
        { mode: 'append' },
      ),
    );
    expect(append.status).toBe(201);
    expect(append.body.plots[0]).toMatchObject({ samples: 2, skipped: 2, replacedSamples: 0 });
    for (const p of plots) {
      const merged = (await logsAt(p)).flatMap((l) => l.series.t.map((at, i) => [at, l.series.tempC[i]] as const)).sort();
      expect(merged.map(([, v]) => v)).toEqual([10, 11, 12, 13, 20, 20, 20, 20, 30, 30]);
      expect(new Set(merged.map(([at]) => at)).size).toBe(merged.length);
    }

    // A file wholly inside a stored log's period, replaced: the stored log loses those hours only.
    const inside = await lab.post(
      URL,
      body(
        hourly(0, 2, () => 5),
        { mode: 'replace' },
      ),
    );
    expect(inside.body.plots[0]).toMatchObject({ samples: 2, replacedSamples: 2 });
    const merged = (await logsAt(plots[1])).flatMap((l) => l.series.t.map((at, i) => [at, l.series.tempC[i]] as const)).sort();
    expect(merged.map(([, v]) => v)).toEqual([5, 5, 12, 13, 20, 20, 20, 20, 30, 30]);
  });
});

import { randomUUID } from 'node:crypto';
import { COLLARS_40_CSV, COLLARS_40_FIXED, makeLayout, makeUser } from '../fixtures/setup/setup-world';
import { demoEmail, signIn, startTestApp, type Session, type TestApp } from '../support/test-app';

type RowPreview = { row: number; errors: { column: string; message: string }[] };

describe('collar CSV import: preview, then all or nothing', () => {
  let t: TestApp;
  let admin: Session, crew: Session, lab: Session;
  beforeAll(async () => {
    t = await startTestApp();
    [admin, crew, lab] = await Promise.all((['admin', 'crew', 'lab'] as const).map((r) => signIn(t.app, demoEmail(r))));
  });
  afterAll(() => t.close());

  const collarCount = async (s: Session, siteId: string) => (await s.get(`/api/collars?siteId=${siteId}&limit=1`)).body.total as number;

  it('when a 40-row file with two bad rows is previewed, then each bad row is named with its column and nothing is stored', async () => {
    const { site } = await makeLayout(admin);
    const res = await admin.post(`/api/sites/${site.id}/collar-import/preview`, { csv: COLLARS_40_CSV });
    expect(res.status).toBe(200);
    expect(res.body.validRows).toBe(38);
    expect(res.body.errorRows).toBe(2);
    expect(res.body.fileErrors).toEqual([]);
    expect(res.body.mapping).toMatchObject({
      code: 'code',
      plot: 'plot',
      latitude: 'lat',
      longitude: 'lon',
      diameterCm: 'diameter_cm',
      installedOn: 'installed_on',
    });
    const bad = (res.body.rows as RowPreview[]).filter((r) => r.errors.length);
    expect(bad).toEqual([
      {
        row: 8,
        cells: expect.any(Object),
        errors: [{ row: 8, column: 'diameter_cm', message: '"200 mm" is in mm; Inner diameter must be in cm' }],
      },
      { row: 23, cells: expect.any(Object), errors: [{ row: 23, column: 'lat', message: 'Latitude must be at most 90 °' }] },
    ]);
    expect(await collarCount(admin, site.id)).toBe(0);
  });

  it('when the file with bad rows is committed, then nothing is stored and every bad row is listed', async () => {
    const { site } = await makeLayout(admin);
    const res = await admin.post(`/api/sites/${site.id}/collar-import/commit`, { csv: COLLARS_40_CSV });
    expect(res.status).toBe(400);
    expect(res.body.error.message).toBe('Nothing was imported: 2 rows have errors');
    expect(res.body.error.fields).toEqual([
      { path: 'row 8 · diameter_cm', message: '"200 mm" is in mm; Inner diameter must be in cm' },
      { path: 'row 23 · lat', message: 'Latitude must be at most 90 °' },
    ]);
    expect(await collarCount(admin, site.id)).toBe(0);
  });

  it('when the corrected file is committed, then all 40 collars exist with derived area and text kept verbatim; a repeat stores nothing', async () => {
    const { site, plots } = await makeLayout(admin);
    const res = await admin.post(`/api/sites/${site.id}/collar-import/commit`, { csv: COLLARS_40_FIXED });
    expect(res.status).toBe(201);
    expect(res.body.created).toBe(40);
    const list = (await admin.get(`/api/collars?siteId=${site.id}&limit=100`)).body;
    expect(list.total).toBe(40);
    const c03 = list.items.find((c: { code: string }) => c.code === 'C03');
    expect(c03.notes).toBe('Near the <script>alert(1)</script> stump, "east" side');
    expect(c03.plotId).toBe(plots[0].id);
    expect(c03.areaCm2).toBeCloseTo(Math.PI * 100, 6); // π d²/4, d = 20 cm (plain geometry)
    expect(c03.installedOn).toBe('2025-04-04');
    const c22 = list.items.find((c: { code: string }) => c.code === 'C22');
    expect([c22.latitude, c22.plotId]).toEqual([50.97362, plots[2].id]);

    const again = await admin.post(`/api/sites/${site.id}/collar-import/commit`, { csv: COLLARS_40_FIXED });
    expect(again.status).toBe(400);
    expect(again.body.error.message).toBe('Nothing was imported: 40 rows have errors');
    expect(again.body.error.fields[0]).toEqual({ path: 'row 2 · code', message: 'A collar C01 exists at this site already' });
    expect(await collarCount(admin, site.id)).toBe(40);
  });

  it('when a later row repeats an earlier code, then the good rows before it are not stored either', async () => {
    const { site } = await makeLayout(admin);
    const csv = 'code,plot,diameter_cm\nA1,P1,20\nA2,P1,20\nA1,P2,20\n';
    const res = await admin.post(`/api/sites/${site.id}/collar-import/commit`, { csv });
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toEqual([{ path: 'row 4 · code', message: 'Collar A1 appears twice in the file (also row 2)' }]);
    expect(await collarCount(admin, site.id)).toBe(0);
  });

  it('when cells are malformed, in the wrong unit or out of range, then each message names the row and column', async () => {
    const { site } = await makeLayout(admin);
    const csv = [
      'code,plot,diameter_cm,height_cm,installed_on,lat',
      'K1,P1,"20,5",10,2025-04-01,50.1', // decimal comma
      'K2,P9,20,10,2025-04-01,50.1', // unknown plot
      'K3,P1,2,10,2025-04-01,50.1', // diameter below 5 cm
      'K4,P1,20,4 in,2025-04-01,50.1', // inches
      'K5,P1,20,10,2025-02-30,50.1', // no such day
      'K6,P1,,10,2025-04-01,50.1', // no diameter for a round collar
    ].join('\n');
    const res = await admin.post(`/api/sites/${site.id}/collar-import/preview`, { csv });
    const errs = (res.body.rows as RowPreview[]).flatMap((r) => r.errors);
    expect(errs).toEqual([
      { row: 2, column: 'diameter_cm', message: '"20,5" is not a number (use a point as the decimal separator)' },
      { row: 3, column: 'plot', message: 'No plot "P9" at this site' },
      { row: 4, column: 'diameter_cm', message: 'Collar diameter must be at least 5 cm' },
      { row: 5, column: 'height_cm', message: '"4 in" is in in; Height must be in cm' },
      { row: 6, column: 'installed_on', message: '"2025-02-30" is not a date YYYY-MM-DD' },
      { row: 7, column: 'diameter_cm', message: 'Give the inner diameter (round) or both sides (rectangular)' },
    ]);
  });

  it('when a column header declares the wrong unit or the CSV is broken, then the file is refused before any row', async () => {
    const { site } = await makeLayout(admin);
    const mm = await admin.post(`/api/sites/${site.id}/collar-import/preview`, { csv: 'code,plot,Diameter (mm)\nM1,P1,200\n' });
    expect(mm.body.fileErrors).toEqual([
      { row: 1, column: 'Diameter (mm)', message: 'Inner diameter is given in mm; the import takes cm (convert the column first)' },
    ]);
    const commit = await admin.post(`/api/sites/${site.id}/collar-import/commit`, { csv: 'code,plot,Diameter (mm)\nM1,P1,200\n' });
    expect(commit.status).toBe(400);
    expect(commit.body.error.message).toBe('Nothing was imported: the file has errors');

    const ragged = await admin.post(`/api/sites/${site.id}/collar-import/preview`, {
      csv: 'code,plot,diameter_cm\nR1,P1,20,extra\nR2,P1,"20\n',
    });
    expect(ragged.body.fileErrors.map((e: { row: number; message: string }) => [e.row, e.message.split(':')[0]])).toEqual(
      expect.arrayContaining([
        [2, 'Row has 4 cells but the header has 3'],
        [3, 'Malformed CSV'],
      ]),
    );

    const noPlot = await admin.post(`/api/sites/${site.id}/collar-import/preview`, { csv: 'code,diameter_cm\nN1,20\n' });
    expect(noPlot.body.fileErrors).toEqual([{ row: 1, column: 'Plot code', message: 'No column is mapped to Plot code' }]);
  });

  it('when a column is mapped by hand, then that header is used', async () => {
    const { site } = await makeLayout(admin);
    const res = await admin.post(`/api/sites/${site.id}/collar-import/preview`, {
      csv: 'Ring,Parcel,Ring size cm\nH1,P2,25\n',
      mapping: { code: 'Ring', plot: 'Parcel', diameterCm: 'Ring size cm' },
    });
    expect(res.body.fileErrors).toEqual([]);
    expect(res.body.validRows).toBe(1);
    const bad = await admin.post(`/api/sites/${site.id}/collar-import/preview`, { csv: 'a,b\n1,2\n', mapping: { girth: 'a' } });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields[0]).toEqual({ path: 'mapping.girth', message: expect.stringMatching(/^Unknown import field "girth"/) });
  });

  it('when the file is larger than 512 KiB or missing, then a readable 400 comes back and nothing is read', async () => {
    const { site } = await makeLayout(admin);
    const big = `code,plot,diameter_cm\n${'X,P1,20\n'.repeat(70_000)}`;
    const res = await admin.post(`/api/sites/${site.id}/collar-import/preview`, { csv: big });
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toEqual([{ path: 'csv', message: 'The file is larger than 512 KiB; split it into smaller files' }]);
    const none = await admin.post(`/api/sites/${site.id}/collar-import/preview`, {});
    expect(none.body.error.fields).toEqual([{ path: 'csv', message: 'Send the CSV text in "csv"' }]);
  });

  it('when crew or lab import, they are refused by role; a lead needs membership of the site', async () => {
    const { site } = await makeLayout(admin);
    for (const s of [crew, lab]) {
      const res = await s.post(`/api/sites/${site.id}/collar-import/preview`, { csv: COLLARS_40_FIXED });
      expect([res.status, res.body.error.message]).toEqual([403, 'Your role does not allow this']);
    }
    const outsider = await makeUser(t.app, admin, 'lead', []);
    const refused = await outsider.post(`/api/sites/${site.id}/collar-import/commit`, { csv: COLLARS_40_FIXED });
    expect([refused.status, refused.body.error.message]).toEqual([403, 'You are not a member of this site']);
    const member = await makeUser(t.app, admin, 'lead', [site.id]);
    const ok = await member.post(`/api/sites/${site.id}/collar-import/commit`, { csv: COLLARS_40_FIXED });
    expect([ok.status, ok.body.created]).toEqual([201, 40]);
    const missing = await admin.post(`/api/sites/${randomUUID()}/collar-import/preview`, { csv: COLLARS_40_FIXED });
    expect([missing.status, missing.body.error.message]).toEqual([404, 'There is no such site']);
  });
});

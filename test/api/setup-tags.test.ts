import { COLLARS_40_FIXED, makeLayout, makeUser } from '../fixtures/setup/setup-world';
import { decodePdfQrCodes } from '../fixtures/setup/pdf-qr';
import { demoEmail, signIn, startTestApp, type Session, type TestApp } from '../support/test-app';

const binary = (res: { on(e: string, cb: (c?: Buffer) => void): void }, cb: (err: Error | null, body: Buffer) => void) => {
  const parts: Buffer[] = [];
  res.on('data', (c) => parts.push(c!));
  res.on('end', () => cb(null, Buffer.concat(parts)));
};

describe('printable collar tag sheet', () => {
  let t: TestApp;
  let admin: Session, crew: Session, lab: Session;
  let siteId: string;
  let collars: { id: string; code: string }[];
  beforeAll(async () => {
    t = await startTestApp();
    [admin, crew, lab] = await Promise.all((['admin', 'crew', 'lab'] as const).map((r) => signIn(t.app, demoEmail(r))));
    siteId = (await makeLayout(admin)).site.id;
    expect((await admin.post(`/api/sites/${siteId}/collar-import/commit`, { csv: COLLARS_40_FIXED })).status).toBe(201);
    collars = (await admin.get(`/api/collars?siteId=${siteId}&limit=100`)).body.items;
  });
  afterAll(() => t.close());

  const sheet = (s: Session, query: string) => s.get(`/api/sites/${siteId}/collar-tags.pdf${query}`).buffer(true).parse(binary);

  it('when an A4 sheet is printed, then every collar has exactly one QR code that scans to its own address', async () => {
    const res = await sheet(admin, '?paper=a4');
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toBe('application/pdf');
    expect(res.headers['x-tag-count']).toBe('40');
    const pdf = res.body as Buffer;
    expect(pdf.subarray(0, 5).toString()).toBe('%PDF-');
    expect(pdf.toString('latin1')).toMatch(/\/MediaBox \[0 0 595\.2\d* 841\.8\d*\]/);

    const { pages, codes } = decodePdfQrCodes(pdf);
    expect(pages).toBe(2); // 21 tags a page
    expect(codes.map((c) => c.length)).toEqual([21, 19]);
    const scanned = codes.flat();
    const ids = scanned.map((u) => /\/walk\/collars\/([0-9a-f-]{36})$/.exec(u)?.[1]);
    expect(new Set(ids).size).toBe(40);
    expect([...ids].sort()).toEqual(collars.map((c) => c.id).sort());
    expect(scanned[0]).toMatch(/^http:\/\/127\.0\.0\.1:\d+\/walk\/collars\//);
  });

  it('when a Letter sheet is printed, then the page is 8.5 × 11 in and all 40 codes still scan', async () => {
    const res = await sheet(admin, '?paper=letter');
    const pdf = res.body as Buffer;
    expect(pdf.toString('latin1')).toMatch(/\/MediaBox \[0 0 612 792\]/);
    const { pages, codes } = decodePdfQrCodes(pdf);
    expect(pages).toBe(2);
    expect(codes.flat()).toHaveLength(40);
  });

  it('when one plot is asked for, then only its collars are on the sheet', async () => {
    const p2 = (await admin.get(`/api/plots?siteId=${siteId}`)).body.items.find((p: { code: string }) => p.code === 'P2');
    const res = await sheet(admin, `?plotId=${p2.id}`);
    expect(res.headers['x-tag-count']).toBe('10');
    expect(decodePdfQrCodes(res.body as Buffer).codes.flat()).toHaveLength(10);
  });

  it('when the paper is unknown, then 400 names the choices', async () => {
    const res = await admin.get(`/api/sites/${siteId}/collar-tags.pdf?paper=a3`);
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toEqual([{ path: 'paper', message: 'paper must be a4 or letter' }]);
  });

  it('when crew or lab ask, they are refused by role; a lead outside the site is refused by membership', async () => {
    for (const s of [crew, lab]) expect((await s.get(`/api/sites/${siteId}/collar-tags.pdf`)).status).toBe(403);
    const outsider = await makeUser(t.app, admin, 'lead', []);
    const res = await outsider.get(`/api/sites/${siteId}/collar-tags.pdf`);
    expect([res.status, res.body.error.message]).toEqual([403, 'You are not a member of this site']);
    const member = await makeUser(t.app, admin, 'lead', [siteId]);
    expect((await sheet(member, '')).headers['x-tag-count']).toBe('40');
  });

  describe('blank tags for collars not installed yet', () => {
    const blank = (s: Session, query: string) => s.get(`/api/sites/${siteId}/blank-collar-tags.pdf${query}`).buffer(true).parse(binary);

    it('when 25 blank tags with a code prefix are printed, then each QR holds a fresh collar id and its planned code in order', async () => {
      const res = await blank(admin, '?count=25&codePrefix=N-&firstNumber=101');
      expect(res.status).toBe(200);
      expect(res.headers['x-tag-count']).toBe('25');
      expect(res.headers['content-disposition']).toMatch(/^attachment; filename="new-collar-tags-.*-a4\.pdf"$/);
      const { pages, codes } = decodePdfQrCodes(res.body as Buffer);
      expect(pages).toBe(2);
      const read = codes.flat().map((u) => /\/walk\/collars\/([0-9a-f-]{36})\?code=([^&]+)$/.exec(u));
      expect(read.every(Boolean)).toBe(true);
      expect(read.map((m) => decodeURIComponent(m![2]))).toEqual(Array.from({ length: 25 }, (_, i) => `N-${101 + i}`));
      const ids = read.map((m) => m![1]);
      expect(new Set(ids).size).toBe(25);
      expect(ids.filter((id) => collars.some((c) => c.id === id))).toEqual([]);
    });

    it('when no prefix is given, then the tags carry only an id (the crew types the code) and a second sheet has other ids', async () => {
      const one = decodePdfQrCodes((await blank(admin, '?count=3')).body as Buffer).codes.flat();
      const two = decodePdfQrCodes((await blank(admin, '?count=3')).body as Buffer).codes.flat();
      for (const u of [...one, ...two]) expect(u).toMatch(/\/walk\/collars\/[0-9a-f-]{36}$/);
      expect(new Set([...one, ...two]).size).toBe(6);
    });

    it('when planned codes are already used at the site, then 409 names them and nothing is printed', async () => {
      expect(collars.map((c) => c.code)).toEqual(expect.arrayContaining(['C09', 'C10']));
      const res = await admin.get(`/api/sites/${siteId}/blank-collar-tags.pdf?count=2&codePrefix=C&firstNumber=9&digits=2`);
      expect(res.status).toBe(409);
      expect(res.body.error.message).toBe('These codes are already used at this site: C09, C10. Choose another prefix or first number.');
      const free = await blank(admin, '?count=2&codePrefix=C&firstNumber=41&digits=2');
      expect(
        decodePdfQrCodes(free.body as Buffer)
          .codes.flat()
          .map((u) => u.split('?code=')[1]),
      ).toEqual(['C41', 'C42']);
    });

    it('when the options are out of range, then 400 names each field', async () => {
      const res = await admin.get(`/api/sites/${siteId}/blank-collar-tags.pdf?count=501&codePrefix=${encodeURIComponent('<b>x')}`);
      expect(res.status).toBe(400);
      expect(res.body.error.fields.map((f: { path: string }) => f.path).sort()).toEqual(['codePrefix', 'count']);
      const orphan = await admin.get(`/api/sites/${siteId}/blank-collar-tags.pdf?firstNumber=3`);
      expect(orphan.body.error.fields).toEqual([{ path: 'firstNumber', message: 'firstNumber needs a codePrefix' }]);
    });

    it('when crew or lab ask, they are refused by role; a lead outside the site by membership', async () => {
      for (const s of [crew, lab]) expect((await s.get(`/api/sites/${siteId}/blank-collar-tags.pdf`)).status).toBe(403);
      const outsider = await makeUser(t.app, admin, 'lead', []);
      expect((await outsider.get(`/api/sites/${siteId}/blank-collar-tags.pdf`)).status).toBe(403);
    });
  });
});

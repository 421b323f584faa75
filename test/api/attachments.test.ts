import { createHash, randomUUID } from 'node:crypto';
import { makeSiteWithCollar } from '../support/fixtures';
import { startFakeS3 } from '../support/fake-s3';
import { demoEmail, signIn, startTestApp, type Session, type TestApp } from '../support/test-app';

const LEAD_ID = '1a6f0c3e-2d4b-4e8a-9c1f-3b5d7e9f1a02';

describe('attachment bytes in object storage', () => {
  let t: TestApp;
  let s3: Awaited<ReturnType<typeof startFakeS3>>;
  let lead: Session;
  let world: Awaited<ReturnType<typeof makeSiteWithCollar>>;
  beforeAll(async () => {
    s3 = await startFakeS3();
    t = await startTestApp({ objectStorage: s3.config });
    const admin = await signIn(t.app, demoEmail('admin'));
    lead = await signIn(t.app, demoEmail('lead'));
    world = await makeSiteWithCollar(admin, lead, LEAD_ID);
  });
  afterAll(async () => {
    await t.close();
    await s3.stop();
  });

  const csv = Buffer.from('t_s;co2_ppm\n0;421,5\n1;422,1\n', 'utf8');
  const sha = createHash('sha256').update(csv).digest('hex');
  async function record(overrides: Record<string, unknown> = {}) {
    const res = await lead.post('/api/attachments', {
      siteId: world.site.id,
      ownerEntity: 'collar',
      ownerId: world.collar.id,
      fileName: 'logger-2026-06-01.csv',
      mediaType: 'text/csv',
      sizeBytes: csv.length,
      sha256: sha,
      ...overrides,
    });
    return res.body.record;
  }
  const put = (id: string, body: Buffer, type = 'text/csv') =>
    lead.agent.put(`/api/attachments/${id}/content`).set('X-CSRF-Token', lead.csrf).set('Content-Type', type).send(body);

  it('when the bytes match the record, then they are stored, the record gets its objectKey and a retry changes nothing', async () => {
    const a = await record();
    const first = await put(a.id, csv);
    expect(first.status).toBe(200);
    expect(first.body.record.objectKey).toBe(`sites/${world.site.id}/attachments/${a.id}`);
    expect(first.body.record.rev).toBe(2);
    const again = await put(a.id, csv);
    expect(again.body.record.rev).toBe(2);
    const back = await lead
      .get(`/api/attachments/${a.id}/content`)
      .buffer(true)
      .parse((res, cb) => {
        const chunks: Buffer[] = [];
        res.on('data', (c: Buffer) => chunks.push(c));
        res.on('end', () => cb(null, Buffer.concat(chunks)));
      });
    expect(
      createHash('sha256')
        .update(back.body as Buffer)
        .digest('hex'),
    ).toBe(sha);
  });

  it('when the bytes, size or type do not match, then nothing is stored and the message says why', async () => {
    const a = await record();
    const corrupt = Buffer.from(csv);
    corrupt[5] = 0x41;
    expect((await put(a.id, corrupt)).body.error.message).toMatch(/checksum/);
    expect((await put(a.id, csv.subarray(1))).body.error.message).toMatch(/bytes but its record says/);
    expect((await put(a.id, csv, 'image/png')).status).toBe(415);
    expect((await lead.get(`/api/attachments/${a.id}`)).body.record.objectKey).toBeNull();
  });

  it('when a file is over the limit or of another type, then the record itself is refused', async () => {
    const big = await lead.post('/api/attachments', {
      siteId: world.site.id,
      ownerEntity: 'collar',
      ownerId: world.collar.id,
      mediaType: 'text/csv',
      sizeBytes: 6 * 1024 * 1024,
      sha256: sha,
    });
    expect(big.body.error.fields[0].message).toMatch(/limited to 5 MiB/);
    const exe = await lead.post('/api/attachments', {
      siteId: world.site.id,
      ownerEntity: 'collar',
      ownerId: world.collar.id,
      mediaType: 'application/x-msdownload',
      sizeBytes: 10,
      sha256: sha,
    });
    expect(exe.body.error.fields[0].path).toBe('mediaType');
  });

  it("when another site's crew sends bytes, then the attachment is not found for them", async () => {
    const a = await record();
    const crew = await signIn(t.app, demoEmail('crew'));
    const res = await crew.agent
      .put(`/api/attachments/${a.id}/content`)
      .set('X-CSRF-Token', crew.csrf)
      .set('Content-Type', 'text/csv')
      .send(csv);
    expect(res.status).toBe(404);
    expect((await put(randomUUID(), csv)).status).toBe(404);
  });

  it("when a leak check keeps its logger file, then the file belongs to the check and the check's files list by owner", async () => {
    const analyzer = (await (await signIn(t.app, demoEmail('admin'))).post('/api/analyzers', { siteId: world.site.id, name: 'Bench unit' }))
      .body.record;
    const check = (
      await lead.post('/api/analyzer-checks', {
        siteId: world.site.id,
        analyzerId: analyzer.id,
        kind: 'leak',
        at: '2026-06-01T06:00:00.000Z',
        slopeUmolMolS: 0.01,
        passed: true,
      })
    ).body.record;
    const a = await record({ ownerEntity: 'analyzerCheck', ownerId: check.id, fileName: 'plate.csv' });
    await record(); // a collar's file, not the check's
    expect((await put(a.id, csv)).status).toBe(200);
    const listed = await lead.get(`/api/attachments?siteId=${world.site.id}&ownerEntity=analyzerCheck&ownerId=${check.id}`);
    expect(listed.body.items.map((x: { id: string; fileName: string }) => [x.id, x.fileName])).toEqual([[a.id, 'plate.csv']]);
    const wrongOwner = await lead.post('/api/attachments', {
      siteId: world.site.id,
      ownerEntity: 'analyzer',
      ownerId: analyzer.id,
      mediaType: 'text/csv',
      sizeBytes: csv.length,
      sha256: sha,
    });
    expect(wrongOwner.body.error.fields[0]).toMatchObject({ path: 'ownerEntity', message: expect.stringContaining('analyzerCheck') });
    expect((await lead.get(`/api/attachments?ownerEntity=analyzer`)).status).toBe(400);
  });
});

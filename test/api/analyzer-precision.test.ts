import { makeSiteWithCollar } from '../support/fixtures';
import { demoEmail, signIn, startTestApp, type Session, type TestApp } from '../support/test-app';

const LEAD_ID = '1a6f0c3e-2d4b-4e8a-9c1f-3b5d7e9f1a02';

describe('Analyzer precision behind the minimum detectable flux (Christiansen et al. 2015, after Parkin et al. 2012)', () => {
  let t: TestApp;
  let lead: Session, admin: Session;
  let siteId: string;
  beforeAll(async () => {
    t = await startTestApp();
    [lead, admin] = await Promise.all((['lead', 'admin'] as const).map((r) => signIn(t.app, demoEmail(r))));
    siteId = (await makeSiteWithCollar(admin, lead, LEAD_ID)).site.id;
  });
  afterAll(() => t.close());

  it('when an analyzer is recorded without a precision, then it stays unknown (null) rather than a stored 1 ppm; a stated one is kept', async () => {
    const none = await admin.post('/api/analyzers', { siteId, name: 'No spec sheet' });
    expect(none.status).toBe(201);
    expect(none.body.record.precisionPpm).toBeNull();
    const stated = await admin.post('/api/analyzers', { siteId, name: 'Stated', precisionPpm: 0.4 });
    expect(stated.body.record.precisionPpm).toBe(0.4);
  });
});

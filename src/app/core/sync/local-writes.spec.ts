import { TestBed } from '@angular/core/testing';
import { signedInDevice, TEST_SITE } from '../db/testing/signed-in-device';
import { validated } from '../db/validated';
import { LocalWrites } from './local-writes';

const ANALYZER = '55555555-5555-4555-8555-555555555555';
const CSV = 'time_s,co2_ppm\n0,420\n20,420\n30,420.2\n';

describe('LocalWrites.createWithFile', () => {
  afterEach(() => localStorage.clear());

  const check = validated('analyzerCheck', {
    siteId: TEST_SITE,
    analyzerId: ANALYZER,
    kind: 'leak',
    at: '2026-06-12T07:00:00.000Z',
    slopeUmolMolS: 0.02,
    passed: true,
    note: '',
  });

  it('when a check is saved with its file, then the check, an attachment owned by it and the bytes are kept, each queued once', async () => {
    const { db } = await signedInDevice();
    const { record, attachmentId } = await TestBed.inject(LocalWrites).createWithFile('analyzerCheck', check, {
      blob: new Blob([CSV], { type: 'text/csv' }),
      fileName: 'plate.csv',
      mediaType: 'text/csv',
    });
    expect(await db.records('analyzerCheck').get(record.id)).toMatchObject({ kind: 'leak', slopeUmolMolS: 0.02 });
    // SHA-256 of the file's bytes, as `printf 'time_s,co2_ppm\n0,420\n20,420\n30,420.2\n' | sha256sum` gives it.
    expect(await db.records('attachment').get(attachmentId)).toMatchObject({
      siteId: TEST_SITE,
      ownerEntity: 'analyzerCheck',
      ownerId: record.id,
      fileName: 'plate.csv',
      mediaType: 'text/csv',
      sizeBytes: CSV.length,
      sha256: '5e1581919123cc1d4000ca0fae4f41fe7d8a5d91128bd8fc95a434150a5af896',
    });
    expect(await db.blobs.get(attachmentId)).toMatchObject({ attachmentId, mediaType: 'text/csv', uploadedAt: null });
    expect((await db.outbox.toArray()).map((o) => [o.entity, o.id])).toEqual([
      ['analyzerCheck', record.id],
      ['attachment', attachmentId],
    ]);
  });

  it('when the file is refused (a type the server does not take), then neither the check nor the file is kept', async () => {
    const { db } = await signedInDevice();
    await expect(
      TestBed.inject(LocalWrites).createWithFile('analyzerCheck', check, {
        blob: new Blob(['x']),
        fileName: 'plate.exe',
        mediaType: 'application/octet-stream',
      }),
    ).rejects.toThrow('Allowed types');
    expect(await db.records('analyzerCheck').count()).toBe(0);
    expect(await db.records('attachment').count()).toBe(0);
    expect(await db.outbox.count()).toBe(0);
  });

  it('when the bytes cannot be stored (device full), then the check already written in that transaction is rolled back too', async () => {
    const { db } = await signedInDevice();
    jest.spyOn(db.blobs, 'put').mockRejectedValueOnce(new DOMException('The quota has been exceeded.', 'QuotaExceededError'));
    await expect(
      TestBed.inject(LocalWrites).createWithFile('analyzerCheck', check, {
        blob: new Blob([CSV]),
        fileName: 'plate.csv',
        mediaType: 'text/csv',
      }),
    ).rejects.toThrow('quota');
    expect(await db.records('analyzerCheck').count()).toBe(0);
    expect(await db.records('attachment').count()).toBe(0);
    expect(await db.outbox.count()).toBe(0);
  });
});

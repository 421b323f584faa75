import { dataLicence } from '../../shared/results/data-licences';
import { REVIEW_STATES } from '../../shared/model/progress-state';
import { dataPackage, type Provenance } from './data-package';
import { TABLES } from './export-schema';

// 20:30 UTC on 1 June 2026 is 08:30 on 2 June in Auckland (NZST, UTC+12, tz database).
const provenance = {
  engineVersion: 'test',
  generatedAt: '2026-06-01T20:30:00.000Z',
  generatedBy: { id: 'u', name: 'Lab', email: 'lab@x' },
  jobId: 'job-1',
  site: { id: 's', name: 'Hollow Creek', timezone: 'Pacific/Auckland', tempDepthCm: 5, tempDepthToleranceCm: 1 },
  license: dataLicence('CC-BY-4.0')!,
  parameters: {},
  counts: {},
} as Provenance;

describe('data package dates and state words', () => {
  it('when the package is named, then its day is the site’s day of the export, not the UTC day', () => {
    expect(dataPackage(provenance, {}, {}).name).toBe('fluxwalk-hollow-creek-2026-06-02');
  });

  it('when the closures table lists review states, then they are the shared review states', () => {
    const field = TABLES.find((t) => t.name === 'closures')!.fields.find((f) => f.name === 'review_state')!;
    expect(field.enum).toEqual([...REVIEW_STATES]);
  });
});

import { ENTITY_FIELDS } from '../../shared/model/entities';
import { buildCurrentCampaign } from './demo-current';
import { buildLayout } from './demo-layout';
import { buildSeason, SEASON } from './demo-season';
import { buildTemperatureLogs } from './demo-temperature-logs';

describe('demo season plan', () => {
  const layout = buildLayout();
  const season = buildSeason(layout);
  const current = buildCurrentCampaign(layout);

  it('when every create of the season, the current campaign and the logs is checked against the shared schemas, then all pass', () => {
    const all = [...season.writes, ...current, ...buildTemperatureLogs(layout)].filter((w) => w.kind === 'create');
    const bad = all.filter((w) => !ENTITY_FIELDS[w.entity].safeParse(w.fields).success).map((w) => `${w.entity}:${w.id}`);
    expect(bad).toEqual([]);
  });

  it('when ids are collected, then no record is created twice', () => {
    const ids = [...layout.writes, ...season.writes, ...current].filter((w) => w.kind === 'create').map((w) => w.id);
    expect(new Set(ids).size).toBe(ids.length);
  });

  it('when a campaign is locked, then nothing of it is written after the lock', () => {
    for (const [i, c] of SEASON.entries()) {
      const id = season.campaignIds[i];
      const lockAt = season.writes.findIndex((w) => w.entity === 'campaign' && w.kind === 'update' && w.id === id);
      expect([c.key, lockAt]).not.toEqual([c.key, -1]);
      const after = season.writes.slice(lockAt + 1).filter((w) => w.fields['campaignId'] === id);
      expect(after).toEqual([]);
    }
  });

  it('when closures are listed, then each has 121 samples at 1 Hz and every redo names a closure of the same visit', () => {
    const closures = season.writes.filter((w) => w.entity === 'closure' && w.kind === 'create');
    expect(closures.length).toBe(7 * 48 - 1 + 5);
    for (const c of closures) expect((c.fields['series'] as { tS: number[] }).tS).toHaveLength(121);
    const byId = new Map(closures.map((c) => [c.id, c]));
    const redos = closures.filter((c) => c.fields['redoOfId']);
    expect(redos).toHaveLength(5);
    for (const r of redos) expect(byId.get(r.fields['redoOfId'] as string)!.fields['visitId']).toBe(r.fields['visitId']);
  });

  it('when the lab reviews, then it touches only April and the west loop of May, and every rejection has a reason', () => {
    const reviews = season.writes.filter((w) => w.entity === 'closure' && w.kind === 'update');
    const closures = new Map(season.writes.filter((w) => w.entity === 'closure' && w.kind === 'create').map((w) => [w.id, w]));
    const months = new Set(reviews.map((r) => String(closures.get(r.id)!.fields['startedAt']).slice(0, 7)));
    expect(months).toEqual(new Set(['2026-04', '2026-05']));
    expect(reviews.length).toBe(48 + 1 + 24 + 1);
    for (const r of reviews.filter((x) => x.fields['reviewState'] === 'rejected'))
      expect(String(r.fields['reviewReason']).length).toBeGreaterThan(10);
    expect(reviews.filter((x) => x.fields['reviewState'] === 'rejected')).toHaveLength(5);
  });

  it('when the current campaign is built, then its 7 visits lie on 1 December in walking order of the west loop', () => {
    const visits = current.filter((w) => w.entity === 'visit');
    expect(visits.map((v) => v.fields['collarId'])).toEqual(layout.routes[0].collarIds.slice(0, 7));
    for (const v of visits) expect(String(v.fields['arrivedAt']).slice(0, 10)).toBe('2026-12-01');
    expect(visits.filter((v) => v.fields['skipped'])).toHaveLength(1);
  });
});

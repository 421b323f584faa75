/// <reference lib="dom" />
import { randomUUID } from 'node:crypto';
import { readFileSync } from 'node:fs';
import { Client } from 'pg';
import { Page } from 'playwright-core';
import { seriousAccessibilityProblems, signInAs } from './support/app-actions';
import { type Browser, withScreenshotOnFailure } from './support/browser';
import { browserSuite } from './support/suite';
import { syncNow, waitForFirstSync } from './support/sync-actions';

jest.setTimeout(420_000);

const SITE = '0f3c2a9e-5b1d-4c7e-9a2f-6d8e1b4c7a10'; // the demo site
const CREW_ID = '1a6f0c3e-2d4b-4e8a-9c1f-3b5d7e9f1a01';
const LEAD_ID = '1a6f0c3e-2d4b-4e8a-9c1f-3b5d7e9f1a02';

// The server inherits the fake mailbox's address: the digest it sends goes there.
const suite = browserSuite({ mail: true });
const { server } = suite;
/** The lead's browser: the second test goes on signed in where the first left the Board. */
let lead: Browser;

async function noSeriousProblems(page: Page, where: string) {
  const problems = await seriousAccessibilityProblems(page);
  expect([where, problems]).toEqual([where, []]);
}

async function choose(page: Page, label: string, option: string | RegExp) {
  await page.getByRole('combobox', { name: label, exact: true }).click();
  await page.getByRole('option', { name: option }).click();
}

/** Retries a read until the expectation holds or 20 s pass, then reports the last difference. */
function poll<T>(read: () => Promise<T>) {
  const until = async (check: (v: T) => void) => {
    const deadline = Date.now() + 20_000;
    for (;;) {
      const v = await read();
      try {
        check(v);
        return;
      } catch (err) {
        if (Date.now() > deadline) throw err;
      }
      await new Promise((r) => setTimeout(r, 250));
    }
  };
  return {
    toEqual: (want: unknown) => until((v) => expect(v).toEqual(want)),
    toBe: (want: unknown) => until((v) => expect(v).toBe(want)),
    toContain: (want: string) => until((v) => expect(v).toContain(want)),
  };
}

async function openTab(page: Page, name: string) {
  await page.getByRole('tab', { name, exact: true }).click();
}

/** Shown rows of the progress table (only those the virtual scroll renders), by collar code. */
async function shownStates(page: Page): Promise<Record<string, string>> {
  return page
    .locator('[data-testid="progress-row"]')
    .evaluateAll((rows) => Object.fromEntries(rows.map((r) => [r.getAttribute('data-collar') ?? '', r.getAttribute('data-state') ?? ''])));
}

/**
 * Field records the crew's device stores through its device store: each record in its Dexie
 * table and one outbox op in the same IndexedDB transaction, as the outbox writer does; then
 * "Sync now" pushes them through the sync engine.
 */
async function recordOnCrewDevice(page: Page, records: { entity: string; fields: Record<string, unknown> }[]) {
  await page.evaluate(
    async ({ dbName, records }) => {
      const db = await new Promise<IDBDatabase>((resolve, reject) => {
        const req = indexedDB.open(dbName);
        req.onsuccess = () => resolve(req.result);
        req.onerror = () => reject(req.error);
      });
      const tables = [...new Set(records.map((r) => r.entity)), 'outbox'];
      const tx = db.transaction(tables, 'readwrite');
      const now = new Date().toISOString();
      for (const r of records) {
        const id = String(r.fields['id']);
        const { id: _id, ...fields } = r.fields;
        tx.objectStore(r.entity).add({ ...fields, id, rev: 0, deleted: false });
        tx.objectStore('outbox').add({
          opId: crypto.randomUUID(),
          entity: r.entity,
          id,
          baseRev: null,
          op: 'upsert',
          fields,
          base: {},
          sentAt: null,
          createdAt: now,
          updatedAt: now,
        });
      }
      await new Promise<void>((resolve, reject) => {
        tx.oncomplete = () => resolve();
        tx.onerror = () => reject(tx.error);
      });
      db.close();
    },
    { dbName: `fluxwalk-user-${CREW_ID}`, records },
  );
  await syncNow(page);
}

function visitOps(campaignId: string, collarId: string, round: number, what: 'offset' | 'skip') {
  const visitId = randomUUID();
  const at = `2026-12-0${round + 4}T09:00:00Z`;
  const visit = {
    entity: 'visit',
    fields: {
      id: visitId,
      siteId: SITE,
      campaignId,
      round,
      collarId,
      crewId: CREW_ID,
      arrivedAt: at,
      skipped: what === 'skip',
      skipReason: what === 'skip' ? 'Fallen spruce across the collar' : null,
    },
  };
  if (what === 'skip') return [visit];
  return [
    visit,
    {
      entity: 'offsetSet',
      fields: { id: randomUUID(), siteId: SITE, visitId, collarId, campaignId, takenAt: at, readingsCm: [2.4, 2.6, 2.5, 2.5] },
    },
  ];
}

describe('Board in Chromium', () => {
  it('when the lead plans, watches a collar turn complete after the crew syncs, exports and closes the campaign', async () => {
    lead = await suite.open({ untilEnd: true });
    const page = lead.page;
    await withScreenshotOnFailure(page, 'board-plan', async () => {
      await signInAs(page, server.baseUrl, 'lead');
      // A short loop of three demo collars for this campaign (routes are made in Setup).
      const collars = (
        (await (await page.request.get(`${server.baseUrl}/api/collars?siteId=${SITE}&limit=3`)).json()) as {
          items: { id: string; code: string }[];
        }
      ).items;
      const csrf = ((await (await page.request.get(`${server.baseUrl}/api/auth/csrf`)).json()) as { token: string }).token;
      const routeRes = await page.request.post(`${server.baseUrl}/api/routes`, {
        headers: { 'X-CSRF-Token': csrf },
        data: { siteId: SITE, name: 'Short loop', collarIds: collars.map((c) => c.id) },
      });
      expect(routeRes.status()).toBe(201);

      await page.goto(`${server.baseUrl}/board`);
      await page.locator('[data-testid="progress-row"]').first().waitFor();
      await noSeriousProblems(page, 'Board progress');

      await openTab(page, 'Plan');
      await page.getByLabel('Name', { exact: true }).fill('Board test, two rounds');
      await page.getByLabel('Starts on').fill('2026-12-05');
      await page.getByLabel('Ends on').fill('2026-12-06');
      await page.getByLabel('Rounds', { exact: true }).fill('2');
      await page.getByLabel('Closures per collar and round').fill('0');
      await page.getByRole('checkbox', { name: 'Probe readings due' }).uncheck();
      await page.getByRole('button', { name: 'Create campaign' }).click();
      await page.getByText('Campaign "Board test, two rounds" created').waitFor();
      await page.getByRole('checkbox', { name: 'Short loop' }).check();
      await choose(page, 'Crew on Short loop', 'Rowan Ashby');
      await page.keyboard.press('Escape');
      await page.getByRole('button', { name: 'Save plan' }).click();
      await page.getByText('Saved: 1 route(s) in "Board test, two rounds".').waitFor();
      // Reorder the loop by dragging its first collar below the second, then save.
      await choose(page, 'Route to reorder', 'Short loop');
      const stops = page.getByTestId('order-list').locator('li');
      await page.getByTestId('order-list').locator(`li[data-collar="${collars[0].code}"]`).waitFor(); // codes shown once collars load
      await page.getByRole('button', { name: 'Save order' }).scrollIntoViewIfNeeded();
      const from = (await stops.nth(0).boundingBox())!;
      const to = (await stops.nth(1).boundingBox())!;
      await page.mouse.move(from.x + 12, from.y + from.height / 2);
      await page.mouse.down();
      await page.mouse.move(from.x + 12, from.y + from.height / 2 + 6, { steps: 4 });
      await page.mouse.move(to.x + 12, to.y + to.height * 0.9, { steps: 12 });
      await page.mouse.up();
      await poll(() => stops.evaluateAll((ls) => ls.map((l) => l.getAttribute('data-collar')))).toEqual([
        collars[1].code,
        collars[0].code,
        collars[2].code,
      ]);
      await page.getByRole('button', { name: 'Save order' }).click();
      await page.getByText('Order of "Short loop" saved.').waitFor();
      const routeId = (await routeRes.json()).record.id as string;
      expect((await (await page.request.get(`${server.baseUrl}/api/routes/${routeId}`)).json()).record.collarIds).toEqual([
        collars[1].id,
        collars[0].id,
        collars[2].id,
      ]);
      await noSeriousProblems(page, 'Board plan');
      const campaign = (
        (await (await page.request.get(`${server.baseUrl}/api/campaigns?siteId=${SITE}&limit=100`)).json()) as {
          items: { id: string; name: string; routes: unknown[] }[];
        }
      ).items.find((c) => c.name === 'Board test, two rounds')!;
      expect(campaign.routes).toEqual([{ routeId: (await routeRes.json()).record.id, crewIds: [CREW_ID], direction: 'alternate' }]);

      await openTab(page, 'Progress');
      await choose(page, 'Round', 'Round 1');
      await choose(page, 'Needs', 'Needs offset');
      await poll(() => shownStates(page)).toEqual(Object.fromEntries(collars.map((c) => [c.code, 'due'])));

      // The crew records an offset set on their own device and syncs.
      const crew = await suite.open();
      await signInAs(crew.page, server.baseUrl, 'crew');
      await waitForFirstSync(crew.page);
      await recordOnCrewDevice(crew.page, visitOps(campaign.id, collars[0].id, 1, 'offset'));
      await poll(
        async () => (await (await page.request.get(`${server.baseUrl}/api/offset-sets?campaignId=${campaign.id}`)).json()).total,
      ).toBe(1);

      await page.getByRole('button', { name: 'Refresh' }).click();
      await poll(() => shownStates(page)).toEqual({ [collars[1].code]: 'due', [collars[2].code]: 'due' });
      await choose(page, 'Needs', 'Anything');
      await poll(async () => (await shownStates(page))[collars[0].code]).toBe('complete');

      // Round 2 and the two collars the crew could not reach; then the campaign can be closed.
      await recordOnCrewDevice(crew.page, [
        ...visitOps(campaign.id, collars[0].id, 2, 'offset'),
        ...[1, 2].flatMap((r) => [collars[1], collars[2]].flatMap((c) => visitOps(campaign.id, c.id, r, 'skip'))),
      ]);
      await poll(async () => (await (await page.request.get(`${server.baseUrl}/api/visits?campaignId=${campaign.id}`)).json()).total).toBe(
        6,
      );
      await choose(page, 'Round', 'All rounds');
      await page.getByRole('button', { name: 'Refresh' }).click();
      await poll(() => shownStates(page)).toEqual({
        [collars[0].code]: 'complete',
        [collars[1].code]: 'skipped',
        [collars[2].code]: 'skipped',
      });

      const [download] = await Promise.all([page.waitForEvent('download'), page.getByTestId('progress-csv').click()]);
      const csv = readFileSync((await download.path())!, 'utf8')
        .trim()
        .split('\r\n');
      expect(csv).toHaveLength(4);
      // Rows follow the new walking order.
      expect(csv.slice(1).map((l) => l.split(',')[0])).toEqual([collars[1].code, collars[0].code, collars[2].code]);
      expect(csv[2]).toMatch(new RegExp(`^${collars[0].code},Short loop,P\\d+,[A-Z ]+,all,complete,,complete,2,2`));
      expect(csv[1]).toContain(',skipped,Fallen spruce across the collar,');

      await page.getByRole('button', { name: 'Close campaign' }).click();
      await poll(() => page.getByTestId('lock-state').innerText()).toContain('Closed');
      expect((await (await page.request.get(`${server.baseUrl}/api/campaigns/${campaign.id}`)).json()).record.locked).toBe(true);

      for (const tab of ['Map', 'Anomalies', 'Devices']) {
        await openTab(page, tab);
        await page
          .getByRole('heading', { name: tab === 'Map' ? 'Map' : tab })
          .first()
          .waitFor({ state: 'attached' });
        if (tab === 'Devices') await page.getByTestId('device-row').first().waitFor();
        if (tab === 'Anomalies') await page.getByText(/^As of /).waitFor();
        await noSeriousProblems(page, `Board ${tab.toLowerCase()}`);
      }
      // The crew's device is listed with what it last reported.
      expect(await page.getByTestId('device-row').filter({ hasText: 'Rowan Ashby' }).count()).toBeGreaterThan(0);

      // The digest on demand: a preview of what it says, then "send now" to the lead, read back from the fake mailbox.
      await openTab(page, 'Digest');
      await page.getByRole('button', { name: 'Preview digest' }).click();
      const preview = page.getByTestId('digest-preview');
      await preview.waitFor();
      const digest = (
        (await (await page.request.get(`${server.baseUrl}/api/sites/${SITE}/digest`)).json()) as {
          digest: { campaigns: { routes: { due: string[] }[] }[] };
        }
      ).digest;
      const due = digest.campaigns.reduce((n, c) => n + c.routes.reduce((m, r) => m + r.due.length, 0), 0);
      expect(await preview.locator('h4').count()).toBe(digest.campaigns.length + 2);
      await noSeriousProblems(page, 'Board digest');
      const seen = suite.smtp.messagesTo('lead@fluxwalk.example').length;
      await page.getByRole('button', { name: 'Send me the digest now' }).click();
      await page
        .getByTestId('digest-status')
        .getByText(`Digest sent to lead@fluxwalk.example (${due} collar(s) due).`)
        .waitFor({ timeout: 60_000 });
      const mail = await suite.smtp.waitFor('lead@fluxwalk.example', { seen, timeoutMs: 10_000 });
      expect(mail.subject).toMatch(/^Daily digest: .+, \d{4}-\d{2}-\d{2}$/);

      // Without signal the Board shows its last answers, and says so.
      await openTab(page, 'Progress');
      await lead.context.setOffline(true);
      await page.getByRole('button', { name: 'Refresh' }).click();
      await page.getByText(/^No connection: showing the Board as it was at /).waitFor();
      expect(await shownStates(page)).toEqual({
        [collars[0].code]: 'complete',
        [collars[1].code]: 'skipped',
        [collars[2].code]: 'skipped',
      });
      await lead.context.setOffline(false);
    });
  });

  it('when a campaign holds 5 000 collars, then the first rows show within 300 ms of the data, the DOM keeps fewer than 200 rows and the map draws them within a second', async () => {
    const campaignId = await seedLargeCampaign(5000);
    const page = lead.page;
    await withScreenshotOnFailure(page, 'board-5000', async () => {
      await openTab(page, 'Progress');
      await page.evaluate(() => {
        performance.clearMarks();
        const w = window as unknown as { fwRowsAt?: number };
        w.fwRowsAt = undefined;
        const seen = () => document.querySelector('[data-testid="progress-row"][data-collar^="BIG-"]');
        const mo = new MutationObserver(() => {
          if (w.fwRowsAt === undefined && seen()) {
            w.fwRowsAt = performance.now();
            mo.disconnect();
          }
        });
        mo.observe(document.body, { subtree: true, childList: true });
      });
      await page.getByRole('button', { name: 'Refresh' }).click(); // the campaign was inserted behind the app's back
      await page.waitForLoadState('networkidle');
      await choose(page, 'Campaign', /Large campaign/);
      await page.locator('[data-testid="progress-row"][data-collar^="BIG-"]').first().waitFor();
      const timing = await page.evaluate((id) => {
        const data = performance.getEntriesByName('board-progress-data').at(-1)!.startTime;
        const res = performance
          .getEntriesByType('resource')
          .filter((e) => e.name.includes(`/api/campaigns/${id}/progress`))
          .at(-1) as PerformanceResourceTiming;
        return { dataMark: data, responseEnd: res?.responseEnd ?? null, rowsAt: (window as unknown as { fwRowsAt: number }).fwRowsAt };
      }, campaignId);
      const afterParse = timing.rowsAt - timing.dataMark;
      const afterResponse = timing.responseEnd === null ? null : timing.rowsAt - timing.responseEnd;
      console.log(
        `[board] 5 000 collars: first rows ${afterParse.toFixed(0)} ms after the progress data reached the app` +
          (afterResponse === null ? '' : ` (${afterResponse.toFixed(0)} ms after the response ended)`),
      );
      // "After the data arrives" taken strictly: from the end of the HTTP response, so JSON parsing counts too.
      expect(afterResponse ?? afterParse).toBeLessThanOrEqual(300);
      expect(await page.getByText(/5000 collar\(s\) shown/).count()).toBe(1);
      const inDom = await page.locator('[data-testid="progress-row"]').count();
      await page.getByTestId('progress-viewport').evaluate((el) => el.scrollTo(0, el.scrollHeight));
      await page.locator('[data-testid="progress-row"][data-collar="BIG-5000"]').waitFor();
      const inDomAtEnd = await page.locator('[data-testid="progress-row"]').count();
      console.log(`[board] rows in the DOM: ${inDom} at the top, ${inDomAtEnd} at the bottom`);
      expect(Math.max(inDom, inDomAtEnd)).toBeLessThan(200);

      // The same 5 000 collars on the map: time from the start of a draw to the first task after the next frame.
      await page.evaluate(() => performance.clearMeasures('board-map-draw'));
      const opened = Date.now();
      await openTab(page, 'Map');
      const draw = await page
        .waitForFunction(
          () =>
            performance
              .getEntriesByName('board-map-draw')
              .map((m) => ({ ms: m.duration, markers: ((m as PerformanceMeasure).detail as { markers: number }).markers }))
              .find((m) => m.markers >= 5000) ?? null,
          undefined,
          { timeout: 60_000 },
        )
        .then((h) => h.jsonValue());
      const tabToMarkers = Date.now() - opened;
      console.log(`[board] map: ${draw!.markers} markers drawn in ${draw!.ms.toFixed(0)} ms (tab click to drawn: ${tabToMarkers} ms)`);
      // One DOM element per marker took 1 819 ms here; the canvas layer 205 ms. A second is the budget on a shared machine.
      expect(draw!.ms).toBeLessThanOrEqual(1000);
      // Drawn as one canvas: find a point well inside a "due" shape (#8a4b00 all around it, not an edge another
      // marker may overlap) and click it; the popup names the collar and its state.
      const dueSpot = () =>
        page.locator('canvas.fw-collar-canvas').evaluate((c: HTMLCanvasElement) => {
          const ctx = c.getContext('2d')!;
          const img = ctx.getImageData(0, 0, c.width, c.height).data;
          const box = c.getBoundingClientRect();
          const ratio = c.width / box.width;
          const due = (x: number, y: number) => {
            if (x < 0 || y < 0 || x >= c.width || y >= c.height) return false;
            const i = (y * c.width + x) * 4;
            return img[i] === 0x8a && img[i + 1] === 0x4b && img[i + 2] === 0x00 && img[i + 3] === 255;
          };
          const r = Math.max(2, Math.round(2 * ratio));
          for (let y = 0; y < c.height; y++) {
            for (let x = 0; x < c.width; x++) {
              if (due(x, y) && due(x - r, y) && due(x + r, y) && due(x, y - r) && due(x, y + r)) {
                return { x: box.left + x / ratio, y: box.top + y / ratio };
              }
            }
          }
          return null;
        });
      // The map may still move after the first full draw (the plots arriving refit it): click only once
      // the same spot is found twice in a row, so the click lands where the shape still is.
      let spot = await dueSpot();
      for (let tries = 0; tries < 20; tries++) {
        await page.waitForTimeout(300);
        const again = await dueSpot();
        if (spot && again && spot.x === again.x && spot.y === again.y) break;
        spot = again;
      }
      expect(spot).not.toBeNull();
      await page.mouse.click(spot!.x, spot!.y);
      await page
        .locator('.leaflet-popup-content')
        .getByText(/^BIG-\d{4}: due$/)
        .waitFor();
      await noSeriousProblems(page, 'Board map with 5 000 collars');
    });
  });
});

/** 5 000 extra collars, a route through them and an open campaign, inserted set-wise on the demo site. */
async function seedLargeCampaign(n: number): Promise<string> {
  const db = new Client({ connectionString: process.env['E2E_DATABASE_URL'] });
  await db.connect();
  try {
    const campaignId = randomUUID();
    const routeId = randomUUID();
    await db.query('BEGIN');
    const [plot] = (await db.query(`SELECT id FROM plot WHERE site_id = $1 AND NOT deleted ORDER BY code LIMIT 1`, [SITE])).rows;
    const [at] = (
      await db.query(`SELECT avg(latitude) AS lat, avg(longitude) AS lon FROM collar WHERE site_id = $1 AND latitude IS NOT NULL`, [SITE])
    ).rows;
    // A 100-column grid, 1 m apart, beside the demo collars, so the map has 5 000 positions to draw.
    await db.query(
      `INSERT INTO collar (id, site_id, code, plot_id, shape, diameter_cm, area_cm2, status, updated_by, latitude, longitude)
      SELECT gen_random_uuid(), $1, 'BIG-' || lpad(i::text, 4, '0'), $2, 'round', 20, 314.16, 'active', $3,
             $5::float8 + 0.001 + ((i - 1) / 100) * 0.000009, $6::float8 + ((i - 1) % 100) * 0.000013 FROM generate_series(1, $4) i`,
      [SITE, plot.id, LEAD_ID, n, Number(at.lat), Number(at.lon)],
    );
    await db.query(
      `INSERT INTO route (id, site_id, name, collar_ids, updated_by)
      SELECT $1, $2, 'Large loop', array_agg(id ORDER BY code), $3 FROM collar WHERE site_id = $2 AND code LIKE 'BIG-%'`,
      [routeId, SITE, LEAD_ID],
    );
    await db.query(
      `INSERT INTO campaign (id, site_id, name, starts_on, ends_on, rounds, due_offset, due_closures, due_probes, routes, updated_by)
      VALUES ($1, $2, 'Large campaign', '2026-12-20', '2026-12-21', 1, true, 1, true, $3::jsonb, $4)`,
      [campaignId, SITE, JSON.stringify([{ routeId, crewIds: [CREW_ID], direction: 'alternate' }]), LEAD_ID],
    );
    await db.query('COMMIT');
    return campaignId;
  } finally {
    await db.end();
  }
}

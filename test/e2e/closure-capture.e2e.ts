/// <reference lib="dom" />
// Callbacks passed to page.evaluate() run in the browser and use its DOM types.
import { createHash } from 'node:crypto';
import { readFileSync } from 'node:fs';
import path from 'node:path';
import type { Page } from 'playwright-core';
import { createObjectStorage } from '../../server/attachments/object-storage';
import { signInAs, waitForServiceWorkerControl } from './support/app-actions';
import { browserSuite, queryE2eDatabase } from './support/suite';
import { syncNow, waitForFirstSync, waitForSyncLabel } from './support/sync-actions';
import { choose } from './support/walk-actions';

jest.setTimeout(600_000);

/**
 * The logger file of this day (test/fixtures/logger/README.md): four closures, two at each of two
 * collars, written by an analyzer whose clock runs 73 s ahead of the phone. The phone's clock is
 * set (Playwright's clock) so that the crew's taps fall exactly where the file says, 73 s earlier.
 */
const FIXTURE = path.resolve(__dirname, '../fixtures/logger/walk-two-collars.csv');
const OFFSET_S = 73;
/** Chamber on/off on the phone (UTC; Europe/Berlin is UTC+1 in December). */
const TAPS = [
  ['2026-12-03T08:41:00Z', '2026-12-03T08:43:00Z'],
  ['2026-12-03T08:45:00Z', '2026-12-03T08:47:00Z'],
  ['2026-12-03T08:55:00Z', '2026-12-03T08:57:00Z'],
  ['2026-12-03T08:59:00Z', '2026-12-03T09:01:00Z'],
] as const;
const AMBIENT_PPM = 421.5;

const suite = browserSuite();
const { server } = suite;

const query = queryE2eDatabase;

const sha256 = (b: Buffer) => createHash('sha256').update(b).digest('hex');

async function openCollar(page: Page, code: string): Promise<void> {
  await page.getByRole('link', { name: 'Back to the route' }).click();
  await page.getByTestId('open-code').fill(code);
  await page.getByRole('button', { name: 'Open', exact: true }).click();
  await page.getByTestId('visit-code').filter({ hasText: code }).waitFor();
}

/** One closure by the taps, with the phone's clock moved to the planned moment first. */
async function tapClosure(page: Page, [on, off]: readonly [string, string]): Promise<void> {
  const panel = page.getByRole('region', { name: 'Closures at this visit' });
  await page.clock.setSystemTime(new Date(on));
  await panel.getByRole('button', { name: 'Chamber on' }).click();
  await panel.getByRole('button', { name: 'Chamber off' }).waitFor();
  await page.clock.setSystemTime(new Date(off));
  await panel.getByRole('button', { name: 'Chamber off' }).click();
  await panel.getByRole('button', { name: 'Chamber on' }).waitFor();
}

interface ShownClosure {
  id: string;
  flux: string;
  flags: string[];
}

/** The closure cards on the visit screen: the flux as shown and the flags (each shown in words, its code kept in data-flag). */
async function shownClosures(page: Page): Promise<ShownClosure[]> {
  return page.locator('[data-closure]').evaluateAll((cards) =>
    cards.map((c) => ({
      id: c.getAttribute('data-closure') ?? '',
      flux: c.querySelector('[data-testid="spot-flux"]')?.textContent?.trim() ?? '',
      flags: Array.from(c.querySelectorAll('[data-testid="spot-flags"] li[data-flag]')).map((li) => li.getAttribute('data-flag') ?? ''),
    })),
  );
}

describe('Closure capture in Chromium, offline, then synced', () => {
  it('when the crew taps two closures at each of two collars, imports the logger file, redoes one and syncs, then PostgreSQL has every closure with its result and object storage has the file byte for byte', async () => {
    const fileBytes = readFileSync(FIXTURE);
    await suite.inBrowser('closure-capture', { viewport: { width: 420, height: 900 } }, async (page, { context }) => {
      const user = await signInAs(page, server.baseUrl, 'crew');
      await waitForFirstSync(page);
      await waitForServiceWorkerControl(page);
      // The morning of round 2 on the phone; time flows from here as usual.
      await page.clock.install({ time: new Date('2026-12-03T08:20:00Z') });
      await page.clock.resume();

      await context.setOffline(true);
      await page.goto(`${server.baseUrl}/walk`, { waitUntil: 'load' });
      await page.getByRole('heading', { name: 'Walk', exact: true }).waitFor();

      // Start of day: the analyzer and the day's ambient reading (the clock check is skipped, so
      // the offset must come from the taps).
      await page.getByTestId('start-of-day-link').click();
      await page.getByRole('heading', { name: 'Start of day' }).waitFor();
      await choose(page, 'Analyzer', /.+/);
      await page.getByTestId('ambient-co2').fill(String(AMBIENT_PPM));
      await page.getByRole('button', { name: 'Save ambient' }).click();
      await page.getByTestId('check-clock').getByRole('button', { name: 'Skip with a reason…' }).click();
      await page.getByTestId('skip-reason-clock').fill('Analyzer display unreadable in full sun');
      await page.getByRole('button', { name: 'Save skip' }).click();
      await page.getByTestId('check-clock').getByTestId('check-result').waitFor();

      await page.getByRole('link', { name: 'To the route' }).click();
      await page.getByTestId('route-list').waitFor();
      await choose(page, 'Round', 'Round 2');
      // The list draws only rows near the screen and reuses them: read it once it shows round 2's order.
      await page.locator('[data-testid="route-list"][data-round="2"]').waitFor();
      const codes = (await page.locator('[data-testid^="route-collar-"] .code').allInnerTexts()).map((c) => c.trim());
      const [collarA, collarB] = codes;

      // Collar A: an offset set, then two closures by the taps.
      await page.getByTestId(`route-collar-${collarA}`).click();
      await page.getByTestId('visit-code').filter({ hasText: collarA }).waitFor();
      for (const [i, v] of ['2.0', '2.1', '1.9', '2.0'].entries()) await page.getByTestId(`offset-${i + 1}`).fill(v);
      await page.getByTestId('offset-saved').waitFor();
      await tapClosure(page, TAPS[0]);
      await tapClosure(page, TAPS[1]);
      await page.getByTestId('closure-count').filter({ hasText: '2 of 1 closures due' }).waitFor();

      // Collar B: the same.
      await page.clock.setSystemTime(new Date('2026-12-03T08:52:00Z'));
      await openCollar(page, collarB);
      for (const [i, v] of ['1.6', '1.7', '1.5', '1.6'].entries()) await page.getByTestId(`offset-${i + 1}`).fill(v);
      await page.getByTestId('offset-saved').waitFor();
      await tapClosure(page, TAPS[2]);
      await tapClosure(page, TAPS[3]);
      await page.clock.setSystemTime(new Date('2026-12-03T09:03:00Z'));

      // The logger file: columns mapped, read in the worker, the clock offset found from the taps.
      await page.getByRole('button', { name: 'Import logger file' }).click();
      const dialog = page.getByRole('dialog');
      await dialog.getByLabel('Logger file').setInputFiles(FIXTURE);
      await dialog.getByTestId('layout').filter({ hasText: 'Delimiter: , · decimal point · header on line 1' }).waitFor();
      await choose(page, 'Time column', /^timestamp$/);
      await choose(page, 'Time is', /^a timestamp$/);
      await choose(page, 'Format', /^YYYY-MM-DD HH:mm:ss$/);
      await dialog.getByLabel('Time zone').fill('Europe/Berlin');
      await choose(page, 'CO2 column', /^co2_ppm$/);
      await choose(page, 'CO2 unit', /^µmol\/mol \(ppm\)$/);
      await choose(page, 'H2O column', /^h2o_mmol_mol$/);
      await choose(page, 'Pressure column', /^pressure_kpa$/);
      await choose(page, 'Pressure unit', /^kPa$/);
      await choose(page, 'Chamber air temperature column', /^temp_c$/);
      await dialog.getByRole('button', { name: 'Read the file' }).click();
      await dialog.getByTestId('read-summary').waitFor();
      expect((await dialog.getByTestId('read-summary').innerText()).trim()).toBe('244 samples in 4 closures (split by taps)');
      expect((await dialog.getByTestId('split-method').innerText()).trim()).toBe('by the chamber taps (moved by the clock offset)');
      const offset = Number(await dialog.getByTestId('clock-offset').inputValue());
      // The taps land a few milliseconds after the clock was set: within half a second of 73 s.
      expect(Math.abs(offset - OFFSET_S)).toBeLessThanOrEqual(0.5);
      const statuses = await dialog.locator('fw-piece-card .how').allInnerTexts();
      expect(statuses.map((s) => s.trim())).toEqual(Array(4).fill('matched by its chamber tap'));
      await dialog.getByRole('button', { name: 'Save closures' }).click();
      expect((await dialog.getByTestId('import-done').innerText()).trim()).toBe('4 closures filled from walk-two-collars.csv.');
      await dialog.getByRole('button', { name: 'Close' }).click();
      await dialog.waitFor({ state: 'detached' });

      // Flux on the spot at collar B, then at collar A, where the second closure started high.
      const shown = new Map<string, ShownClosure>();
      await page.locator('[data-closure] [data-testid="spot-flux"]').nth(1).waitFor();
      for (const c of await shownClosures(page)) shown.set(c.id, c);
      await openCollar(page, collarA);
      await page.locator('[data-closure] [data-testid="spot-flux"]').nth(1).waitFor();
      const atA = await shownClosures(page);
      for (const c of atA) shown.set(c.id, c);
      expect(shown.size).toBe(4);
      for (const c of shown.values()) expect(c.flux).toMatch(/^\d+\.\d\d µmol m⁻² s⁻¹/);
      // 610 ppm at the start against the day's 421.5 ppm is more than the 100 ppm margin.
      expect(atA[0].flags).not.toContain('start-above-ambient');
      expect(atA[1].flags).toContain('start-above-ambient');
      expect(await page.locator('[data-closure]').nth(1).locator('.ambient').innerText()).toMatch(
        /^Start vs this analyzer's ambient reading: \+189 ppm$/,
      );

      // Redo the flagged closure: a new closure at the same visit, its short series typed in.
      await page.clock.setSystemTime(new Date('2026-12-03T09:10:00Z'));
      await page.locator(`[data-closure="${atA[1].id}"]`).getByRole('button', { name: 'Redo', exact: true }).click();
      const panel = page.getByRole('region', { name: 'Closures at this visit' });
      await panel.getByRole('button', { name: 'Chamber off' }).waitFor();
      await page.clock.setSystemTime(new Date('2026-12-03T09:12:00Z'));
      await panel.getByRole('button', { name: 'Chamber off' }).click();
      await panel.getByRole('button', { name: 'Enter the series by hand' }).click();
      const typed = [0, 10, 20, 30, 40, 50, 60, 70, 80, 90, 100, 110].map((t) => `${t} ${(424 + 0.55 * t).toFixed(1)}`).join('\n');
      await panel.getByLabel('Seconds and CO2 (ppm), one sample a line').fill(typed);
      await panel.getByLabel('Chamber air °C').fill('4.8');
      await panel.getByLabel('Pressure kPa (optional)').fill('97.0');
      await panel.getByRole('button', { name: 'Save series' }).click();
      await page.locator('[data-closure].redo [data-testid="spot-flux"]').waitFor();
      const redo = (await shownClosures(page)).find((c) => !shown.has(c.id))!;
      expect(redo.flux).toMatch(/^\d+\.\d\d µmol m⁻² s⁻¹/);
      shown.set(redo.id, redo);
      await page.getByTestId('closure-count').filter({ hasText: '2 of 1 closures due' }).waitFor();

      // Still offline: the closures and the file wait on the device, the file counted with them.
      expect(await page.getByTestId('sync-label').innerText()).toMatch(/^Offline · \d+ not yet synced$/);
      await page.getByTestId('sync-indicator').click();
      expect((await page.getByTestId('file-waiting').innerText()).trim()).toMatch(/^File walk-two-collars\.csv · .+ · waiting for upload$/);
      await page.keyboard.press('Escape');
      await page.getByTestId('sync-sheet').waitFor({ state: 'detached' });

      // Signal again: one sync.
      await context.setOffline(false);
      await syncNow(page);
      await waitForSyncLabel(page, /^Up to date$/, 60_000).catch(async (err) => {
        await page.getByTestId('sync-indicator').click();
        throw new Error(`${(err as Error).message}\nsync sheet: ${await page.getByTestId('sync-sheet').innerText()}`);
      });

      // The file is uploaded; its copy stays on the device and the sheet says so.
      await page.getByTestId('sync-indicator').click();
      expect(await page.getByTestId('file-waiting').count()).toBe(0);
      expect((await page.getByTestId('uploaded-list').innerText()).trim()).toMatch(/^walk-two-collars\.csv · .+ · uploaded /);
      await page.keyboard.press('Escape');

      const rows = await query<{
        id: string;
        code: string;
        chamber_on_at: Date;
        started_at: Date;
        flux_umol_m2_s: number | null;
        flags: string[];
        redo_of_id: string | null;
        source_attachment_id: string | null;
        analyzer_id: string | null;
        results: Record<string, unknown> | null;
      }>(
        `SELECT c.id, k.code, c.chamber_on_at, c.started_at, c.flux_umol_m2_s, c.flags, c.redo_of_id, c.source_attachment_id, c.analyzer_id, c.results
        FROM closure c JOIN collar k ON k.id = c.collar_id JOIN visit v ON v.id = c.visit_id
        WHERE v.crew_id = $1 AND v.round = 2 ORDER BY c.chamber_on_at`,
        [user.id],
      );
      expect(rows.map((r) => r.code)).toEqual([collarA, collarA, collarB, collarB, collarA]);
      expect(rows.map((r) => r.id)).toEqual([
        atA[0].id,
        atA[1].id,
        ...[...shown.keys()].filter((id) => id !== atA[0].id && id !== atA[1].id && id !== redo.id),
        redo.id,
      ]);
      for (const [i, r] of rows.entries()) {
        // The engine ran on the server; the crew saw the same number.
        expect(r.results).not.toBeNull();
        expect(r.flux_umol_m2_s).not.toBeNull();
        expect(shown.get(r.id)!.flux.startsWith(`${r.flux_umol_m2_s!.toFixed(2)} µmol`)).toBe(true);
        expect(shown.get(r.id)!.flags).toEqual(r.flags);
        expect(r.analyzer_id).not.toBeNull();
        if (i < 4) {
          // Taps at the planned moments; the series starts where the file does, moved by the offset.
          expect(Math.abs(r.chamber_on_at.getTime() - Date.parse(TAPS[i][0]))).toBeLessThan(1000);
          expect(Math.abs(r.started_at.getTime() - (Date.parse(TAPS[i][0]) + (OFFSET_S - offset) * 1000))).toBeLessThan(1);
        }
      }
      expect(rows[1].flags).toContain('start-above-ambient');
      expect(rows[4].redo_of_id).toBe(rows[1].id);
      // The typed redo by hand: a straight 0.55 ppm/s rise, no water data, 97.0 kPa, 4.8 °C. Ideal gas
      // law F = p·V/(R·T·A)·dχ/dt (R = 8.314462618 J mol⁻¹ K⁻¹, CODATA 2018), V = chamber 4000 cm³ +
      // loop 185 cm³ (the demo's profile from July) + collar area × mean offset 2.0 cm, 20 cm collar.
      const areaM2 = (Math.PI * 0.2 ** 2) / 4;
      const volumeM3 = (4000 + 185) * 1e-6 + areaM2 * 0.02;
      expect(rows[4].flux_umol_m2_s!).toBeCloseTo(((97_000 * volumeM3) / (8.314462618 * (273.15 + 4.8) * areaM2)) * 0.55, 3);
      expect(rows[4].source_attachment_id).toBeNull();
      const attachmentId = rows[0].source_attachment_id;
      expect(rows.slice(0, 4).map((r) => r.source_attachment_id)).toEqual([attachmentId, attachmentId, attachmentId, attachmentId]);

      const [att] = await query<{ sha256: string; size_bytes: string; media_type: string; file_name: string; object_key: string | null }>(
        `SELECT sha256, size_bytes, media_type, file_name, object_key FROM attachment WHERE id = $1`,
        [attachmentId],
      );
      expect(att).toMatchObject({
        sha256: sha256(fileBytes),
        size_bytes: String(fileBytes.length),
        media_type: 'text/csv',
        file_name: 'walk-two-collars.csv',
      });
      expect(att.object_key).toEqual(expect.any(String));
      // Read back through the API and straight from the object store: the same bytes.
      const res = await page.request.get(`${server.baseUrl}/api/attachments/${attachmentId}/content`);
      expect(res.status()).toBe(200);
      expect(sha256(await res.body())).toBe(sha256(fileBytes));
      const object = await createObjectStorage(server.storage).get(att.object_key!);
      const chunks: Buffer[] = [];
      for await (const chunk of object.body) chunks.push(Buffer.from(chunk as Uint8Array));
      expect(sha256(Buffer.concat(chunks))).toBe(sha256(fileBytes));
    });
  });
  it("when the crew taps at two more collars and imports the day's file once from the route, then one confirm fills every tapped closure of both collars with one attachment", async () => {
    await suite.inBrowser('round-import', { viewport: { width: 390, height: 844 } }, async (page) => {
      const user = await signInAs(page, server.baseUrl, 'crew');
      await waitForFirstSync(page);
      await page.clock.install({ time: new Date('2026-12-03T08:20:00Z') });
      await page.clock.resume();
      await page.goto(`${server.baseUrl}/walk/start`, { waitUntil: 'load' });
      await page.getByRole('heading', { name: 'Start of day' }).waitFor();
      await choose(page, 'Analyzer', /.+/);
      await page.getByRole('link', { name: 'To the route' }).click();
      await page.getByTestId('route-list').waitFor();
      await choose(page, 'Round', 'Round 2');
      // The list draws only rows near the screen and reuses them: read it once it shows round 2's order.
      await page.locator('[data-testid="route-list"][data-round="2"]').waitFor();
      const codes = (await page.locator('[data-testid^="route-collar-"] .code').allInnerTexts()).map((c) => c.trim());
      const [, , collarC, collarD] = codes;
      await page.getByTestId(`route-collar-${collarC}`).click();
      await page.getByTestId('visit-code').filter({ hasText: collarC }).waitFor();
      for (const [i, v] of ['2.0', '2.1', '1.9', '2.0'].entries()) await page.getByTestId(`offset-${i + 1}`).fill(v);
      await page.getByTestId('offset-saved').waitFor();
      await tapClosure(page, TAPS[0]);
      await tapClosure(page, TAPS[1]);
      await page.clock.setSystemTime(new Date('2026-12-03T08:52:00Z'));
      await openCollar(page, collarD);
      for (const [i, v] of ['1.6', '1.7', '1.5', '1.6'].entries()) await page.getByTestId(`offset-${i + 1}`).fill(v);
      await page.getByTestId('offset-saved').waitFor();
      await tapClosure(page, TAPS[2]);
      await tapClosure(page, TAPS[3]);
      await page.clock.setSystemTime(new Date('2026-12-03T09:03:00Z'));

      // From the route: one link, the file, one confirm (the plain export needs no mapping).
      await page.getByRole('link', { name: 'Back to the route' }).click();
      let taps = 0;
      await page.getByTestId('round-import-link').click();
      taps++;
      await page.getByLabel('Logger file').setInputFiles(FIXTURE);
      taps++;
      await page.getByTestId('round-summary').waitFor();
      expect((await page.getByTestId('round-summary').innerText()).trim()).toBe(
        '4 closures of 4 closures in walk-two-collars.csv matched to their taps at 2 collars.',
      );
      await page.getByRole('button', { name: 'Save 4 closures' }).click();
      taps++;
      expect((await page.getByTestId('import-done').innerText()).trim()).toBe('4 closures filled from walk-two-collars.csv.');
      expect(taps).toBe(3);
      // Nothing on the screen is wider than the phone.
      expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(390);

      await syncNow(page);
      await waitForSyncLabel(page, /^Up to date$/, 60_000);
      const rows = await query<{ code: string; source_attachment_id: string | null; n: number }>(
        `SELECT k.code, c.source_attachment_id, jsonb_array_length(c.series->'tS') AS n FROM closure c JOIN collar k ON k.id = c.collar_id
          JOIN visit v ON v.id = c.visit_id WHERE v.crew_id = $1 AND v.round = 2 AND k.code = ANY($2) ORDER BY c.chamber_on_at`,
        [user.id, [collarC, collarD]],
      );
      expect(rows.map((r) => [r.code, r.n])).toEqual([
        [collarC, 61],
        [collarC, 61],
        [collarD, 61],
        [collarD, 61],
      ]);
      expect(new Set(rows.map((r) => r.source_attachment_id)).size).toBe(1);
      expect(rows[0].source_attachment_id).not.toBeNull();
    });
  });
});

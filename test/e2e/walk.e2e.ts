/// <reference lib="dom" />
// Callbacks passed to page.evaluate() run in the browser and use its DOM types.
import { createHash } from 'node:crypto';
import path from 'node:path';
import { seriousAccessibilityProblems, signInAs, waitForServiceWorkerControl, type AxeProblem } from './support/app-actions';
import { browserSuite, queryE2eDatabase } from './support/suite';
import { syncNow, waitForFirstSync, waitForSyncLabel } from './support/sync-actions';
import { PHONE, choose, chooseByKeyboard, deviceBlob, readmeShot, testPhoto } from './support/walk-actions';

jest.setTimeout(600_000);

const suite = browserSuite();
const { server } = suite;

const query = queryE2eDatabase;

/** The sealed-plate closure as the analyzer logs it (our plain export: elapsed seconds, CO2 in µmol/mol). */
const LEAK_FILE = 'time_s,co2_ppm\n0,430\n10,425\n20,415.0\n30,415.3\n40,415.6\n50,415.9\n';
/** A blank tag printed for a new collar, planned code N-07 (made by tools/make-walk-qr-fixtures.js). */
const BLANK_TAG = {
  photo: path.resolve(__dirname, '../fixtures/walk/blank-tag-qr.png'),
  id: '9e8d7c6b-5a49-4382-a716-0f1e2d3c4b5a',
  code: 'N-07',
};

describe('Walk in Chromium on a phone, offline', () => {
  it("when the crew works a day offline and then syncs, then every check (with the leak check's logger file), visit, offset set, probe reading, tagged new collar and photo record is in PostgreSQL", async () => {
    // axe on each Walk screen, with whatever the shell shows over it then (the "Offline" snackbar
    // comes and goes with timing); the browser asks for reduced motion, so nothing is half-faded.
    const axe: Record<string, AxeProblem[]> = {};
    await suite.inBrowser('walk-day', { viewport: PHONE }, async (page, { context }) => {
      const user = await signInAs(page, server.baseUrl, 'crew');
      await waitForFirstSync(page);
      await waitForServiceWorkerControl(page);
      const [{ latitude, longitude }] = await query<{ latitude: number; longitude: number }>(
        `SELECT latitude, longitude FROM collar WHERE latitude IS NOT NULL ORDER BY code LIMIT 1`,
      );
      await context.grantPermissions(['geolocation'], { origin: server.baseUrl });
      await context.setGeolocation({ latitude: latitude + 0.0004, longitude: longitude - 0.0003, accuracy: 4 });

      // From here on there is no signal.
      await context.setOffline(true);
      await page.goto(`${server.baseUrl}/walk`, { waitUntil: 'load' });
      await page.getByRole('heading', { name: 'Walk', exact: true }).waitFor();

      // Start of day: safety note acknowledged, analyzer, warm-up, ambient, leak check; clock skipped with a reason.
      await page.getByTestId('start-of-day-link').click();
      await page.getByRole('heading', { name: 'Start of day' }).waitFor();
      await page.getByTestId('safety-note').waitFor();
      await choose(page, 'Analyzer', /.+/);
      await page.getByRole('button', { name: 'I have read the safety note' }).click();
      await page.getByRole('button', { name: 'Warm-up done' }).click();
      await page.getByTestId('ambient-co2').fill('421.5');
      await page.getByRole('button', { name: 'Save ambient' }).click();
      // Leak check: the sealed-plate closure from the analyzer's logger file, fitted after a 20 s settle
      // time: 415.0, 415.3, 415.6, 415.9 every 10 s → 0.03 µmol/mol/s (by hand), within the site's limit.
      await page.getByRole('radio', { name: 'Logger file' }).check();
      await page.getByTestId('leak-settle').fill('20');
      await page
        .getByTestId('leak-file')
        .setInputFiles({ name: 'plate-morning.csv', mimeType: 'text/csv', buffer: Buffer.from(LEAK_FILE) });
      await page.getByTestId('leak-file-name').filter({ hasText: 'plate-morning.csv' }).waitFor();
      await page.getByTestId('leak-fitted').filter({ hasText: 'Slope 0.0300 µmol/mol/s: linear fit of 4 samples, 20–50 s' }).waitFor();
      await page.getByTestId('leak-verdict').filter({ hasText: 'Passes' }).waitFor();
      await page.getByRole('button', { name: 'Save leak check' }).click();
      await page.getByTestId('check-clock').getByRole('button', { name: 'Skip with a reason…' }).click();
      await page.getByTestId('skip-reason-clock').fill('Analyzer display unreadable in full sun');
      await page.getByRole('button', { name: 'Save skip' }).click();
      await page.getByTestId('checks-done').filter({ hasText: '5 of 5 checks done today' }).waitFor();
      // Calibration at the car: zero on scrubbed air, span on a 1000 µmol/mol cylinder; time left at now on the site clock.
      await page.getByRole('button', { name: 'Record a calibration…' }).click();
      await page.getByTestId('cylinder-caution').waitFor();
      for (const [id, v] of [
        ['cal-zero-before', '2.4'],
        ['cal-zero-after', '0.1'],
        ['cal-span-gas', '1000'],
        ['cal-span-cylinder', 'SG-1000-0988'],
        ['cal-span-before', '1012.3'],
        ['cal-span-after', '1000.4'],
      ] as const)
        await page.getByTestId(id).fill(v);
      await page.getByTestId('cal-drift-verdict').filter({ hasText: 'Drift within the site limit.' }).waitFor();
      axe['start of day'] = await seriousAccessibilityProblems(page);
      await page.getByRole('button', { name: 'Save calibration' }).click();
      await page
        .getByTestId('calibration-status')
        .filter({ hasText: /^\s*Last calibrated .*\(0 days ago; due every 180 days\)/ })
        .waitFor();

      // Route: round 2 of the open campaign (picked by keyboard), collars in walking order.
      await page.getByRole('link', { name: 'To the route' }).click();
      await page.getByTestId('route-list').waitFor();
      await chooseByKeyboard(page, 'Round', 'Round 2');
      // Round 2 is planned in reverse: the list re-orders after the choice; read it once it has
      // (its first collar is then the next due one).
      await page.waitForFunction(() => {
        const top = document.querySelector('[data-testid^="route-collar-"] .code')?.textContent?.trim();
        return (
          !!top &&
          (document.querySelector('[data-testid="next-collar"]')?.textContent ?? '').includes(top) &&
          /reverse this round/.test(document.body.textContent ?? '')
        );
      });
      const codes = await page.locator('[data-testid^="route-collar-"] .code').allInnerTexts();
      expect(codes.length).toBeGreaterThanOrEqual(3);
      const [first, second, third] = codes.map((c) => c.trim());
      await page.getByTestId('next-collar').filter({ hasText: first }).waitFor();
      await page
        .getByTestId('next-way')
        .filter({ hasText: / m (N|NE|E|SE|S|SW|W|NW) \(\d+°\)/ })
        .waitFor();
      await readmeShot(page, 'walk-route');
      axe['route'] = await seriousAccessibilityProblems(page);

      // First collar, opened from the "next due" card: conditions, an uneven offset set, probes by permittivity.
      await page.getByTestId('next-collar').getByRole('link').click();
      await page.getByTestId('visit-code').filter({ hasText: first }).waitFor();
      // Conditions by keyboard: focus and Space.
      const rain = page.getByRole('checkbox', { name: 'Rain in the last 24 h' });
      await rain.focus();
      await page.keyboard.press('Space');
      expect(await rain.isChecked()).toBe(true);
      // No Save button: the conditions save themselves after a pause.
      await page.getByTestId('visit-message').filter({ hasText: 'Conditions saved' }).waitFor();
      // Offsets by keypad: type, Enter to the next position; Enter on the last saves.
      await page.getByTestId('offset-1').focus();
      for (const v of ['2.0', '2.1', '1.9', '5.0']) {
        await page.keyboard.type(v);
        if (v !== '5.0') await page.keyboard.press('Enter');
      }
      await page.getByTestId('offset-warning').filter({ hasText: 'Uneven rim' }).waitFor();
      await readmeShot(page, 'walk-visit');
      axe['visit'] = await seriousAccessibilityProblems(page);
      await page.keyboard.press('Enter');
      await page.getByTestId('offset-saved').waitFor();
      await page.getByTestId('soil-temp-1').fill('6.4');
      // Moisture kind by keyboard: arrow from the checked radio to the next one.
      await page.getByRole('radio', { name: 'VWC (%)' }).focus();
      await page.keyboard.press('ArrowDown');
      expect(await page.getByRole('radio', { name: 'Permittivity (Ka)' }).isChecked()).toBe(true);
      await page.getByTestId('moisture-raw').fill('20');
      // Topp et al. (1980) at Ka = 20: 34.5 % (by hand in probe-form.spec.ts).
      await page.getByTestId('moisture-vwc').filter({ hasText: '34.5 % VWC' }).waitFor();
      await page.getByLabel('Rod length (cm)').fill('12');
      await page.getByLabel('Probe id').fill('TDR-2');
      await page.getByTestId('probe-saved').filter({ hasText: /Saved/ }).waitFor();

      // Second collar, opened by its code; the probe kit carries over.
      await page.getByRole('link', { name: 'Back to the route' }).click();
      await page.getByTestId('open-code').fill(second);
      await page.getByRole('button', { name: 'Open', exact: true }).click();
      await page.getByTestId('visit-code').filter({ hasText: second }).waitFor();
      for (const [i, v] of ['1.6', '1.7', '1.5', '1.6'].entries()) await page.getByTestId(`offset-${i + 1}`).fill(v);
      await page.getByTestId('offset-saved').waitFor();
      expect(await page.getByTestId('offset-warning').count()).toBe(0);
      expect(await page.getByLabel('Probe id').inputValue()).toBe('TDR-2');
      await page.getByTestId('soil-temp-1').fill('7.1');
      await page.getByTestId('moisture-raw').fill('10');
      await page.getByTestId('moisture-vwc').filter({ hasText: '18.8 % VWC' }).waitFor();
      await page.getByTestId('probe-saved').filter({ hasText: /Saved/ }).waitFor();

      // Third collar: skipped with a reason, by keyboard.
      await page.getByRole('link', { name: 'Back to the route' }).click();
      await page.getByTestId(`route-collar-${third}`).focus();
      await page.keyboard.press('Enter');
      await page.getByTestId('visit-code').filter({ hasText: third }).waitFor();
      await page.getByTestId('skip-start').focus();
      await page.keyboard.press('Enter');
      await page.getByTestId('skip-reason').focus();
      await page.keyboard.type('Fallen tree across the plot');
      await page.keyboard.press('Tab');
      await page.getByRole('button', { name: 'Skip collar' }).focus();
      await page.keyboard.press('Enter');
      await page.getByTestId('skip-shown').filter({ hasText: 'Fallen tree across the plot' }).waitFor();

      // The map of the route, with our own markers and no tiles.
      await page.getByRole('link', { name: 'Back to the route' }).click();
      await page.getByRole('link', { name: 'Map' }).click();
      await page.locator('.fw-marker[title]').first().waitFor();
      expect(await page.locator(`.fw-marker[title="${third}, skipped"]`).count()).toBe(1);
      expect(await page.locator('.leaflet-tile').count()).toBe(0);
      await readmeShot(page, 'walk-map');
      axe['map'] = await seriousAccessibilityProblems(page);
      // A collar opened from the map by keyboard: its marker takes focus and Enter opens it.
      const marker = page.locator(`.fw-marker[title="${third}, skipped"]`);
      await marker.focus();
      expect(await marker.evaluate((el) => el === document.activeElement && el.tabIndex === 0)).toBe(true);
      await page.keyboard.press('Enter');
      await page.getByTestId('visit-code').filter({ hasText: third }).waitFor();

      // A new collar with a photo.
      await page.getByRole('link', { name: 'Back to the route' }).click();
      await page.getByRole('link', { name: 'Install a collar' }).click();
      await page.getByTestId('buried-services').waitFor();
      // The collar gets a blank tag: a photo of it is read, and its planned code fills in.
      await page.getByLabel('Read a photo of the new tag').setInputFiles(BLANK_TAG.photo);
      await page.getByTestId('install-tag').filter({ hasText: 'Tag 9e8d7c6b: scanning it will open this collar.' }).waitFor();
      expect(await page.getByTestId('install-code').inputValue()).toBe(BLANK_TAG.code);
      await choose(page, 'Plot', /.+/);
      await page.getByTestId('gps-now').filter({ hasText: '± 4 m' }).waitFor();
      await page.getByRole('button', { name: 'Take a fix' }).click();
      await page.getByRole('button', { name: 'Take a fix' }).click();
      await page.getByTestId('install-position').filter({ hasText: '2 fixes' }).waitFor();
      await page.getByTestId('install-diameter').fill('20');
      await page.getByTestId('install-area').filter({ hasText: '314.2 cm²' }).waitFor();
      await page.getByLabel('Height (cm)').fill('10');
      await page.getByLabel('Insertion depth (cm)').fill('5');
      // The photo button by keyboard: focus and Enter open the file chooser. The wait starts before
      // the focus so that Playwright has taken over the chooser by the time Enter lands (a single
      // key press otherwise races it and the headless chooser opens unseen).
      const chooserOpened = page.waitForEvent('filechooser', { timeout: 10_000 });
      await page.getByTestId('install-photo').focus();
      await page.keyboard.press('Enter');
      const chooser = await chooserOpened;
      await chooser.setFiles({ name: 'collar-new.png', mimeType: 'image/png', buffer: testPhoto() });
      await page.getByRole('img', { name: 'Photo 1 of the new collar' }).waitFor();
      axe['install'] = await seriousAccessibilityProblems(page);
      await page.getByRole('button', { name: 'Save the new collar' }).click();
      await page.waitForURL(/\/collars\/[0-9a-f-]{36}$/);
      const newCollarId = page.url().split('/').at(-1)!;
      expect(newCollarId).toBe(BLANK_TAG.id);
      await page.getByTestId('collar-photo').waitFor();

      // Still offline: everything waits on the device, counted.
      const unsynced = await page.getByTestId('sync-label').innerText();
      expect(unsynced).toMatch(/Offline · \d+ not yet synced/);
      const kept = await deviceBlob(page, user.id, newCollarId);
      expect(kept).toHaveLength(1);
      expect(kept[0].type).toBe('image/jpeg');
      expect(kept[0].size).toBe(kept[0].attachment!['sizeBytes']);
      expect(kept[0].sha256).toBe(kept[0].attachment!['sha256']);

      // Signal again: one sync puts it all on the server.
      await context.setOffline(false);
      await syncNow(page);
      await waitForSyncLabel(page, /^Up to date$/, 60_000).catch(async (err) => {
        await page.getByTestId('sync-indicator').click();
        throw new Error(`${(err as Error).message}\nsync sheet: ${await page.getByTestId('sync-sheet').innerText()}`);
      });

      const checks = await query(
        `SELECT kind, skipped, skip_reason, passed, co2_ppm, slope_umol_mol_s, note FROM analyzer_check
        WHERE updated_by = $1 AND at > now() - interval '2 hours' AND at < now() + interval '1 hour' ORDER BY kind`,
        [user.id],
      );
      expect(checks.map((c) => [c['kind'], c['skipped']])).toEqual([
        ['ambient', false],
        ['calibration', false],
        ['clock', true],
        ['leak', false],
        ['safety-ack', false],
        ['warm-up', false],
      ]);
      const [calibration] = await query(
        `SELECT span_cylinder, zero_drift_ppm, drift_ppm, passed FROM analyzer_check
        WHERE updated_by = $1 AND kind = 'calibration'`,
        [user.id],
      );
      expect(calibration).toEqual({ span_cylinder: 'SG-1000-0988', zero_drift_ppm: 2.4, drift_ppm: 12.3, passed: true });
      expect(checks.find((c) => c['kind'] === 'clock')!['skip_reason']).toBe('Analyzer display unreadable in full sun');
      const leak = checks.find((c) => c['kind'] === 'leak')!;
      expect(leak['passed']).toBe(true);
      expect(leak['slope_umol_mol_s']).toBeCloseTo(0.03, 10);
      expect(leak['note']).toMatch(
        /^Linear fit of 4 samples from 20 s to 50 s after a 20 s settle time \(plate-morning\.csv, Piece 1: lines 2–7[^)]*, 6 samples\)$/,
      );
      // The logger file stays with the check as evidence (the bytes go up with the other files; see Closure capture).
      const leakFiles = await query(
        `SELECT a.file_name, a.media_type, a.size_bytes, a.sha256 FROM attachment a
        JOIN analyzer_check c ON c.id = a.owner_id WHERE a.owner_entity = 'analyzerCheck' AND c.kind = 'leak' AND c.updated_by = $1`,
        [user.id],
      );
      expect(leakFiles).toEqual([
        {
          file_name: 'plate-morning.csv',
          media_type: 'text/csv',
          size_bytes: String(LEAK_FILE.length),
          sha256: createHash('sha256').update(LEAK_FILE).digest('hex'),
        },
      ]);
      expect(checks.find((c) => c['kind'] === 'ambient')!['co2_ppm']).toBe(421.5);

      const visits = await query(
        `SELECT c.code, v.round, v.skipped, v.skip_reason, v.conditions FROM visit v JOIN collar c ON c.id = v.collar_id
        WHERE v.updated_by = $1 AND v.round = 2 ORDER BY v.arrived_at`,
        [user.id],
      );
      expect(visits.map((v) => [v['code'], v['skipped'], v['skip_reason']])).toEqual([
        [first, false, null],
        [second, false, null],
        [third, true, 'Fallen tree across the plot'],
      ]);
      expect((visits[0]['conditions'] as Record<string, unknown>)['rain24h']).toBe(true);

      const sets = await query(
        `SELECT c.code, o.readings_cm, o.mean_cm, o.sd_cm FROM offset_set o JOIN collar c ON c.id = o.collar_id
        JOIN visit v ON v.id = o.visit_id WHERE o.updated_by = $1 AND v.round = 2 ORDER BY o.taken_at`,
        [user.id],
      );
      expect(sets.map((s) => [s['code'], s['readings_cm']])).toEqual([
        [first, [2.0, 2.1, 1.9, 5.0]],
        [second, [1.6, 1.7, 1.5, 1.6]],
      ]);
      expect(sets[0]['mean_cm']).toBeCloseTo(2.75, 10);
      expect(sets[0]['sd_cm']).toBeCloseTo(1.5022, 4);

      const probes = await query(
        `SELECT c.code, p.moisture_raw, p.moisture_kind, p.vwc_pct, p.probe_id, p.rod_length_cm, p.soil_temps
        FROM probe_reading p JOIN collar c ON c.id = p.collar_id
        JOIN visit v ON v.id = p.visit_id WHERE p.updated_by = $1 AND v.round = 2 ORDER BY p.taken_at`,
        [user.id],
      );
      expect(probes.map((p) => [p['code'], p['moisture_kind'], p['moisture_raw'], p['probe_id'], p['rod_length_cm']])).toEqual([
        [first, 'permittivity', 20, 'TDR-2', 12],
        [second, 'permittivity', 10, 'TDR-2', 12],
      ]);
      // The server's own Topp conversion agrees with what the device showed.
      expect(probes[0]['vwc_pct']).toBeCloseTo(34.54, 2);
      expect(probes[1]['vwc_pct']).toBeCloseTo(18.83, 2);

      const [collar] = await query(
        `SELECT code, diameter_cm, height_cm, insertion_cm, latitude, longitude, accuracy_m, area_cm2 FROM collar WHERE id = $1`,
        [newCollarId],
      );
      expect(collar).toMatchObject({ code: BLANK_TAG.code, diameter_cm: 20, height_cm: 10, insertion_cm: 5 });
      expect(collar['latitude']).toBeCloseTo(latitude + 0.0004, 6);
      expect(collar['longitude']).toBeCloseTo(longitude - 0.0003, 6);
      const events = await query(`SELECT kind FROM collar_event WHERE collar_id = $1`, [newCollarId]);
      expect(events).toEqual([{ kind: 'installed' }]);
      const atts = await query(`SELECT owner_entity, media_type, size_bytes, sha256 FROM attachment WHERE owner_id = $1`, [newCollarId]);
      expect(atts).toEqual([
        { owner_entity: 'collar', media_type: 'image/jpeg', size_bytes: String(kept[0].size), sha256: kept[0].sha256 },
      ]);
    });
    expect(axe).toEqual({ 'start of day': [], route: [], visit: [], map: [], install: [] });
  });
});

/// <reference lib="dom" />
// Callbacks passed to page.evaluate() run in the browser and use its DOM types.
import { signInAs, waitForServiceWorkerControl } from './support/app-actions';
import { type Browser, withScreenshotOnFailure } from './support/browser';
import { browserSuite } from './support/suite';
import {
  editNotes,
  firstCollars,
  serverCollar,
  shownNotes,
  syncLabel,
  syncNow,
  waitForFirstSync,
  waitForSyncLabel,
} from './support/sync-actions';

jest.setTimeout(240_000);

const suite = browserSuite();
const { server } = suite;
const open = () => suite.open();

async function openCollar(b: Browser, id: string, code: string): Promise<void> {
  await b.page.goto(`${server.baseUrl}/collars/${id}`, { waitUntil: 'load' });
  await b.page.getByTestId('collar-code').filter({ hasText: code }).waitFor({ timeout: 30_000 });
}

describe('Device store and sync in Chromium', () => {
  it('when the crew edits offline, reloads and syncs, then the note reaches the server once; a concurrent lead edit becomes a conflict the crew resolves', async () => {
    const crew = await open();
    await withScreenshotOnFailure(crew.page, 'device-store-crew', async () => {
      const page = crew.page;
      await signInAs(page, server.baseUrl, 'crew');
      await waitForFirstSync(page);
      const [collar] = await firstCollars(page, server.baseUrl, 1);
      await waitForServiceWorkerControl(page);
      await openCollar(crew, collar.id, collar.code);

      // Offline edit, then a reload while still offline: the edit is on the device.
      await crew.context.setOffline(true);
      await editNotes(page, 'Litter layer thick after the storm');
      await page.reload({ waitUntil: 'load' });
      await page.getByTestId('collar-code').filter({ hasText: collar.code }).waitFor({ timeout: 20_000 });
      expect(await shownNotes(page)).toBe('Litter layer thick after the storm');
      await waitForSyncLabel(page, /1 not yet synced/);
      expect(await syncLabel(page)).toContain('1 not yet synced');

      // Back online: one sync puts it on the server at a new rev.
      await crew.context.setOffline(false);
      await syncNow(page);
      await waitForSyncLabel(page, /^Up to date$/);
      const afterFirst = await serverCollar(page, server.baseUrl, collar.id);
      expect(afterFirst.notes).toBe('Litter layer thick after the storm');
      expect(afterFirst.rev).toBe(collar.rev + 1);

      // The lead on a second device and the crew offline edit the same note.
      const lead = await open();
      await withScreenshotOnFailure(lead.page, 'device-store-lead', async () => {
        await signInAs(lead.page, server.baseUrl, 'lead');
        await waitForFirstSync(lead.page);
        await openCollar(lead, collar.id, collar.code);
        expect(await shownNotes(lead.page)).toBe('Litter layer thick after the storm');

        await crew.context.setOffline(true);
        await editNotes(page, 'Crew: collar tilted 5 degrees');
        await editNotes(lead.page, 'Lead: reseat before the next round');
        await syncNow(lead.page);
        await waitForSyncLabel(lead.page, /^Up to date$/);
        expect((await serverCollar(lead.page, server.baseUrl, collar.id)).notes).toBe('Lead: reseat before the next round');

        // The crew syncs second: the server refuses to overwrite and the device shows the conflict.
        await crew.context.setOffline(false);
        await syncNow(page);
        await page.getByTestId('sync-conflicts').waitFor({ timeout: 30_000 });
        await page.getByTestId('sync-indicator').click();
        await page.getByTestId('open-conflicts').click();
        const card = page.getByTestId('conflict');
        await card.waitFor();
        expect((await card.getByTestId('mine-value').innerText()).trim()).toBe('Crew: collar tilted 5 degrees');
        expect((await card.getByTestId('theirs-value').innerText()).trim()).toBe('Lead: reseat before the next round');
        await card.getByRole('radio', { name: 'Mine' }).check();
        await card.getByRole('button', { name: 'Use my picks' }).click();
        await page.getByTestId('no-conflicts').waitFor();
        await syncNow(page);
        await waitForSyncLabel(page, /^Up to date$/);

        // Both devices converge on the picked value, at the server's newest rev.
        const settled = await serverCollar(page, server.baseUrl, collar.id);
        expect(settled.notes).toBe('Crew: collar tilted 5 degrees');
        expect(settled.rev).toBe(afterFirst.rev + 2);
        await syncNow(lead.page);
        await waitForSyncLabel(lead.page, /^Up to date$/);
        await lead.page.getByTestId('collar-notes').filter({ hasText: 'Crew: collar tilted 5 degrees' }).waitFor();
        await openCollar(crew, collar.id, collar.code);
        expect(await shownNotes(page)).toBe('Crew: collar tilted 5 degrees');
      });
    });
  });

  it('when a note contains markup, then it is shown as text and never run', async () => {
    const crew = await open();
    await withScreenshotOnFailure(crew.page, 'device-store-markup', async () => {
      const page = crew.page;
      await signInAs(page, server.baseUrl, 'crew');
      await waitForFirstSync(page);
      const collars = await firstCollars(page, server.baseUrl, 2);
      const c = collars[1];
      await openCollar(crew, c.id, c.code);
      const hostile = '<script>window.__fwInjected = 1</script><img src=x onerror="window.__fwInjected = 2"><b>bold?</b>';
      await editNotes(page, hostile);
      await syncNow(page);
      await waitForSyncLabel(page, /^Up to date$/);
      await page.reload({ waitUntil: 'load' });
      await page.getByTestId('collar-code').filter({ hasText: c.code }).waitFor();

      expect(await shownNotes(page)).toBe(hostile);
      const inside = await page.getByTestId('collar-notes').evaluate((el) => el.querySelectorAll('*').length);
      expect(inside).toBe(0);
      expect(await page.evaluate(() => (window as unknown as { __fwInjected?: number }).__fwInjected)).toBeUndefined();
      expect((await serverCollar(page, server.baseUrl, c.id)).notes).toBe(hostile);
    });
  });
});

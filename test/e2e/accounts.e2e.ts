import { seriousAccessibilityProblems, signInAs } from './support/app-actions';
import { withScreenshotOnFailure } from './support/browser';
import { browserSuite } from './support/suite';

const INVITEE = 'moss.campion@fluxwalk.example';

describe('accounts in the browser', () => {
  // The server inherits the fake mailbox's address: the invitation goes there.
  const suite = browserSuite({ mail: true });
  const { server } = suite;

  it('when the admin invites a crew member, then the link from the mail lets them set a password and they land on Walk', async () => {
    const admin = await suite.open();
    const invitee = await suite.open();
    const { page } = admin;
    await withScreenshotOnFailure(page, 'accounts-invite', async () => {
      await signInAs(page, server.baseUrl, 'admin');
      await page.goto(`${server.baseUrl}/setup`);
      await page.getByRole('tab', { name: 'Members' }).click();
      await page.getByRole('link', { name: 'Invite someone by e-mail' }).click();
      await page.getByRole('heading', { name: 'Invite someone' }).waitFor();
      await page.getByLabel('Their e-mail').fill(INVITEE);
      await expectChecked(page.getByRole('checkbox', { name: 'crew' }));
      await expectChecked(page.getByRole('checkbox', { name: 'Alder Hollow Field Station' }));
      await page.getByRole('button', { name: 'Send invitation' }).click();
      await page.getByText(`Invitation sent to ${INVITEE}`).waitFor();
      await page.getByText(`${INVITEE} · crew`).waitFor();
    });

    const mail = await suite.smtp.waitFor(INVITEE);
    expect(mail.subject).toBe('Invitation to Alder Hollow Field Station on Fluxwalk');
    const link = new RegExp(`${server.baseUrl}/accept-invitation\\?token=[A-Za-z0-9_-]+`).exec(mail.text)?.[0];
    expect(link).toBeDefined();

    const p = invitee.page;
    await withScreenshotOnFailure(p, 'accounts-accept', async () => {
      await p.goto(link!);
      await p.getByText(`with the address ${INVITEE}`).waitFor();
      expect(await seriousAccessibilityProblems(p)).toEqual([]);
      await p.getByLabel('Your name').fill('Moss Campion');
      await p.getByLabel('Choose a password').fill('password2026');
      await p.getByRole('button', { name: 'Create my account' }).click();
      await p.getByText('This password is too common').waitFor();
      await p.getByLabel('Choose a password').fill('Tussock-ridge-walker-8');
      await p.getByRole('button', { name: 'Create my account' }).click();
      await p.waitForURL(`${server.baseUrl}/walk**`);
      await p.getByRole('navigation', { name: 'Screens' }).waitFor();
    });
    const me = await p.request.get(`${server.baseUrl}/api/auth/me`);
    expect((await me.json()).user).toMatchObject({ email: INVITEE, displayName: 'Moss Campion', roles: ['crew'] });

    // The same link a second time: refused, the page says so.
    await p.goto(link!);
    await p.getByText('This invitation link is no longer valid').waitFor();
  });
});

async function expectChecked(box: import('playwright-core').Locator): Promise<void> {
  expect(await box.isChecked()).toBe(true);
}

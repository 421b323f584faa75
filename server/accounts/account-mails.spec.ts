import { invitationMail } from './account-mails';

describe('invitation mail times', () => {
  it('when an invitation names a site, then the link’s expiry reads in that site’s zone, naming it', () => {
    // 20:30 UTC on 1 June is 08:30 on 2 June in Auckland (NZST, UTC+12, tz database).
    const m = invitationMail({
      to: 'new@x',
      inviter: 'Lee',
      siteNames: ['Hollow Creek'],
      roles: ['crew'],
      link: 'https://x/a',
      expiresAt: new Date('2026-06-01T20:30:00Z'),
      timeZone: 'Pacific/Auckland',
    });
    expect(m.text).toContain('until 2026-06-02 08:30 NZST');
  });

  it('when it names no site, then the expiry reads in UTC, naming it', () => {
    const m = invitationMail({
      to: 'new@x',
      inviter: 'Lee',
      siteNames: [],
      roles: ['admin'],
      link: 'https://x/a',
      expiresAt: new Date('2026-06-01T20:30:00Z'),
      timeZone: null,
    });
    expect(m.text).toContain('until 2026-06-01 20:30 UTC');
  });
});

import { TestBed } from '@angular/core/testing';
import { provideHttpClient } from '@angular/common/http';
import { provideHttpClientTesting } from '@angular/common/http/testing';
import { rememberOnDevice, testUser } from '../../core/auth/testing/demo-sessions';
import { AccountApi, type OpenInvitation } from './account-api';
import { InviteMember } from './invite-member';

const settle = () => new Promise((r) => setTimeout(r, 0));

describe('InviteMember: expiry in the site’s zone', () => {
  it('when open invitations are listed, then each expiry reads in its site’s zone, naming it (the device runs in UTC)', async () => {
    localStorage.clear();
    rememberOnDevice(testUser(['admin']), [{ id: 'site-a', name: 'Hollow Creek Meadow', timezone: 'Pacific/Auckland' }]);
    // 20:30 UTC on 1 June is 08:30 on 2 June in Auckland (NZST, UTC+12).
    const open: OpenInvitation[] = [
      {
        id: 'i1',
        email: 'new@fluxwalk.example',
        roles: ['crew'],
        sites: [{ id: 'site-a', name: 'Hollow Creek Meadow' }],
        expiresAt: '2026-06-01T20:30:00.000Z',
        invitedBy: 'Admin',
        createdAt: '2026-05-25T20:30:00.000Z',
      },
    ];
    TestBed.configureTestingModule({
      imports: [InviteMember],
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: AccountApi, useValue: { openInvitations: async () => open } as Partial<AccountApi> },
      ],
    });
    const fixture = TestBed.createComponent(InviteMember);
    await settle();
    await fixture.whenStable();
    fixture.detectChanges();
    expect((fixture.nativeElement as HTMLElement).querySelector('ul.open .meta')!.textContent).toContain(
      'valid until 2026-06-02 08:30 NZST',
    );
  });
});

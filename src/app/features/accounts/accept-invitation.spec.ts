import { HttpErrorResponse, provideHttpClient } from '@angular/common/http';
import { provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { AcceptInvitation } from './accept-invitation';
import { AccountApi, type InvitationPreview } from './account-api';

const settle = () => new Promise((r) => setTimeout(r, 0));

async function pageFor(token: string, lookupInvitation: AccountApi['lookupInvitation']) {
  TestBed.configureTestingModule({
    imports: [AcceptInvitation],
    providers: [
      provideRouter([]),
      provideHttpClient(),
      provideHttpClientTesting(),
      { provide: AccountApi, useValue: { lookupInvitation } as Partial<AccountApi> },
    ],
  });
  const fixture = TestBed.createComponent(AcceptInvitation);
  fixture.componentRef.setInput('token', token);
  fixture.detectChanges();
  await settle();
  await fixture.whenStable();
  fixture.detectChanges();
  return fixture.nativeElement as HTMLElement;
}

describe('AcceptInvitation: opening the link', () => {
  it('when the link carries a token, then the invitation it names is shown with the form', async () => {
    const asked: string[] = [];
    const invitation: InvitationPreview = {
      email: 'new@fluxwalk.example',
      roles: ['crew'],
      sites: [{ id: 'site-a', name: 'Hollow Creek Meadow' }],
      expiresAt: '2026-06-01T20:30:00.000Z',
    };
    const el = await pageFor('tok-1', async (token) => (asked.push(token), invitation));
    expect(asked).toEqual(['tok-1']);
    expect(el.textContent).toContain('with the address new@fluxwalk.example');
    expect(el.querySelector('form')).not.toBeNull();
  });

  it('when the server refuses the token, then its words are shown and no form', async () => {
    const refused = new HttpErrorResponse({ status: 410, error: { error: { message: 'This invitation link is no longer valid' } } });
    const el = await pageFor('tok-2', () => Promise.reject(refused));
    expect(el.querySelector('[role=alert]')!.textContent).toContain('This invitation link is no longer valid');
    expect(el.querySelector('form')).toBeNull();
  });

  it('when the link has no token, then nothing is asked and the page says to open the mail link again', async () => {
    const asked: string[] = [];
    const el = await pageFor('', async (token) => {
      asked.push(token);
      throw new Error('not asked');
    });
    expect(asked).toEqual([]);
    expect(el.querySelector('[role=alert]')!.textContent).toContain('This link has no invitation in it');
  });
});

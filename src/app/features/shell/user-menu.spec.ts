import { provideHttpClient, withInterceptors } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { TestBed } from '@angular/core/testing';
import { MatMenuHarness } from '@angular/material/menu/testing';
import { Router, provideRouter } from '@angular/router';
import { apiInterceptor } from '../../core/api/api-interceptor';
import { SiteChoice } from '../../core/auth/site-choice';
import { rememberOnDevice, testUser } from '../../core/auth/testing/demo-sessions';
import { PendingWorkGuard } from '../../core/sw-update/pending-work-guard';
import { UserMenu } from './user-menu';

const crew = testUser(['crew'], { id: 'u-7', displayName: 'Mira Feldt' });

async function openMenu() {
  TestBed.configureTestingModule({
    imports: [UserMenu],
    providers: [provideRouter([]), provideHttpClient(withInterceptors([apiInterceptor])), provideHttpClientTesting()],
  });
  const fixture = TestBed.createComponent(UserMenu);
  const menu = await TestbedHarnessEnvironment.loader(fixture).getHarness(MatMenuHarness);
  await menu.open();
  return { fixture, menu };
}

describe('UserMenu', () => {
  beforeEach(() => {
    localStorage.clear();
    document.documentElement.classList.remove('fw-outdoor');
    rememberOnDevice(crew);
  });

  it('when opened, then the trigger shows the user name and the menu lists their sites', async () => {
    const { menu } = await openMenu();
    expect(await (await menu.host()).text({ exclude: 'mat-icon' })).toContain('Mira Feldt');
    const sites = await menu.getItems({ text: /Hollow Creek Meadow|Ridge Pine Plots/ });
    expect(sites).toHaveLength(2);
  });

  it('when a site is picked, then it becomes current and is remembered for this user', async () => {
    const { menu } = await openMenu();
    await menu.clickItem({ text: /Ridge Pine Plots/ });
    expect(TestBed.inject(SiteChoice).current()?.id).toBe('site-b');
    expect(JSON.parse(localStorage.getItem('fw.site.u-7')!)).toBe('site-b');
  });

  it('when outdoor contrast is switched on, then the page uses it and the device remembers it', async () => {
    const { menu } = await openMenu();
    await menu.clickItem({ text: /Outdoor contrast/ });
    expect(document.documentElement.classList.contains('fw-outdoor')).toBe(true);
    expect(localStorage.getItem('fw.outdoor')).toBe('true');
  });

  it('when signing out, then the server is told, the device forgets the user and sign-in opens', async () => {
    const { menu } = await openMenu();
    const navigate = jest.spyOn(TestBed.inject(Router), 'navigateByUrl').mockResolvedValue(true);
    await menu.clickItem({ text: /Sign out$/ });
    const backend = TestBed.inject(HttpTestingController);
    backend.expectOne('/api/auth/csrf').flush({ token: 't' });
    await new Promise((r) => setTimeout(r, 0));
    backend.expectOne('/api/auth/logout').flush(null, { status: 204, statusText: 'No Content' });
    await new Promise((r) => setTimeout(r, 0));
    expect(localStorage.getItem('fw.session')).toBeNull();
    expect(navigate).toHaveBeenCalledWith('/sign-in');
  });

  it('when work is not yet synced, then signing out is refused and the user stays', async () => {
    const { menu } = await openMenu();
    TestBed.inject(PendingWorkGuard).report(3);
    await menu.clickItem({ text: /Sign out$/ });
    TestBed.inject(HttpTestingController).expectNone('/api/auth/logout');
    expect(localStorage.getItem('fw.session')).not.toBeNull();
    expect(document.body.textContent).toContain('3 not yet synced');
  });
});

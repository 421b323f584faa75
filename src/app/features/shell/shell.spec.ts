import { provideHttpClient, withInterceptors } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { provideRouter } from '@angular/router';
import { apiInterceptor } from '../../core/api/api-interceptor';
import { Role } from '../../core/auth/session-user';
import { rememberOnDevice, testUser } from '../../core/auth/testing/demo-sessions';
import { Shell } from './shell';

function destinationLinks(fixture: ComponentFixture<Shell>): Promise<MatButtonHarness[]> {
  const nav = TestbedHarnessEnvironment.loader(fixture).getChildLoader('nav[aria-label=Screens]');
  return nav.then((loader) => loader.getAllHarnesses(MatButtonHarness));
}

async function destinationLabelsFor(roles: Role[]): Promise<string[]> {
  localStorage.clear();
  rememberOnDevice(testUser(roles));
  TestBed.configureTestingModule({
    imports: [Shell],
    providers: [provideRouter([]), provideHttpClient(withInterceptors([apiInterceptor])), provideHttpClientTesting()],
  });
  const fixture = TestBed.createComponent(Shell);
  const links = await destinationLinks(fixture);
  // The icon ligature is text too; the label is what the user reads.
  const labels = await Promise.all(links.map(async (l) => (await l.host()).text({ exclude: 'mat-icon' })));
  TestBed.inject(HttpTestingController).match(() => true); // the start-up refresh is not under test here
  return labels.map((l) => l.trim());
}

describe('Shell navigation by role', () => {
  it('when a crew member is signed in, then only Walk is offered', async () => {
    expect(await destinationLabelsFor(['crew'])).toEqual(['Walk']);
  });

  it('when a crew lead is signed in, then Walk, Board and Setup are offered', async () => {
    expect(await destinationLabelsFor(['lead'])).toEqual(['Walk', 'Board', 'Setup']);
  });

  it('when lab staff are signed in, then only Bench is offered', async () => {
    expect(await destinationLabelsFor(['lab'])).toEqual(['Bench']);
  });

  it('when an admin is signed in, then only Setup is offered', async () => {
    expect(await destinationLabelsFor(['admin'])).toEqual(['Setup']);
  });

  it('when a user holds crew and lab roles, then Walk and Bench are offered once each', async () => {
    expect(await destinationLabelsFor(['crew', 'lab'])).toEqual(['Walk', 'Bench']);
  });

  it('when the account has no screen role, then no destination is offered', async () => {
    expect(await destinationLabelsFor([])).toEqual([]);
  });
});

describe('Shell header rows', () => {
  async function render(roles: Role[]) {
    localStorage.clear();
    rememberOnDevice(testUser(roles));
    TestBed.configureTestingModule({
      imports: [Shell],
      providers: [provideRouter([]), provideHttpClient(withInterceptors([apiInterceptor])), provideHttpClientTesting()],
    });
    const fixture = TestBed.createComponent(Shell);
    await fixture.whenStable();
    TestBed.inject(HttpTestingController).match(() => true);
    return fixture.nativeElement as HTMLElement;
  }

  it('when the user has one destination, then its link sits in the toolbar row and the header has no second row', async () => {
    const el = await render(['crew']);
    expect(el.querySelector('mat-toolbar nav[aria-label=Screens]')).not.toBeNull();
    expect(el.querySelectorAll('header > nav')).toHaveLength(0);
    expect(el.querySelector('[data-testid=current-site]')!.textContent!.trim()).not.toBe('');
  });

  it('when the user has several destinations, then they get a row of their own under the toolbar', async () => {
    const el = await render(['lead']);
    expect(el.querySelector('mat-toolbar nav')).toBeNull();
    expect(el.querySelectorAll('header > nav[aria-label=Screens] a')).toHaveLength(3);
  });
});

describe('Shell start-up', () => {
  it('when opened, then it asks the server again who the user is and which sites they see', async () => {
    localStorage.clear();
    rememberOnDevice(testUser(['crew']));
    TestBed.configureTestingModule({
      imports: [Shell],
      providers: [provideRouter([]), provideHttpClient(withInterceptors([apiInterceptor])), provideHttpClientTesting()],
    });
    const fixture = TestBed.createComponent(Shell);
    await fixture.whenStable();
    const backend = TestBed.inject(HttpTestingController);
    backend.expectOne('/api/auth/me').flush({ user: testUser(['crew', 'lead']) });
    await new Promise((r) => setTimeout(r, 0));
    backend.expectOne('/api/sites').flush({ items: [{ id: 'site-c', name: 'Fen Edge', timezone: 'UTC' }], total: 1 });
    await new Promise((r) => setTimeout(r, 0));
    await fixture.whenStable();

    expect(await destinationLinks(fixture)).toHaveLength(3);
    expect(fixture.nativeElement.querySelector('[data-testid=current-site]').textContent.trim()).toBe('Fen Edge');
    expect(JSON.parse(localStorage.getItem('fw.session')!).user.roles).toEqual(['crew', 'lead']);
  });
});

import { provideHttpClient, withInterceptors } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { TestBed } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { Router, provideRouter } from '@angular/router';
import { apiInterceptor } from '../../core/api/api-interceptor';
import { AuthStore } from '../../core/auth/auth-store';
import { TEST_SITES, testUser } from '../../core/auth/testing/demo-sessions';
import { SignIn } from './sign-in';

const tick = () => new Promise((r) => setTimeout(r, 0));

async function fillAndSubmit(email: string, password: string) {
  TestBed.configureTestingModule({
    imports: [SignIn],
    providers: [provideRouter([]), provideHttpClient(withInterceptors([apiInterceptor])), provideHttpClientTesting()],
  });
  const fixture = TestBed.createComponent(SignIn);
  const loader = TestbedHarnessEnvironment.loader(fixture);
  const navigate = jest.spyOn(TestBed.inject(Router), 'navigateByUrl').mockResolvedValue(true);
  await (await loader.getHarness(MatInputHarness.with({ selector: '[type=email]' }))).setValue(email);
  await (await loader.getHarness(MatInputHarness.with({ selector: '[type=password]' }))).setValue(password);
  await (await loader.getHarness(MatButtonHarness.with({ text: 'Sign in' }))).click();
  const backend = TestBed.inject(HttpTestingController);
  backend.expectOne('/api/auth/csrf').flush({ token: 'pre-login' });
  await tick();
  const login = backend.expectOne('/api/auth/login');
  const alertText = async () => {
    await tick();
    await fixture.whenStable();
    return (fixture.nativeElement.querySelector('[role=alert]') as HTMLElement).textContent!.replace(/\s+/g, ' ').trim();
  };
  return { fixture, backend, login, navigate, alertText };
}

describe('SignIn', () => {
  beforeEach(() => localStorage.clear());

  it('when the password is right, then the user is remembered on the device and lands on their first screen', async () => {
    const { backend, login, navigate } = await fillAndSubmit('lab@fluxwalk.example', 'fluxwalk-demo');
    expect(login.request.body).toEqual({ email: 'lab@fluxwalk.example', password: 'fluxwalk-demo' });
    expect(login.request.headers.get('X-CSRF-Token')).toBe('pre-login');
    login.flush({ user: testUser(['lab']) });
    await tick();
    backend.expectOne('/api/sites').flush({ items: TEST_SITES, total: 2 });
    await tick();
    await tick();
    expect(
      TestBed.inject(AuthStore)
        .sites()
        .map((s) => s.name),
    ).toEqual(['Hollow Creek Meadow', 'Ridge Pine Plots']);
    expect(JSON.parse(localStorage.getItem('fw.session')!).user.email).toBe('lab@fluxwalk.example');
    expect(navigate).toHaveBeenCalledWith('/bench');
  });

  it('when the password is wrong, then the server message is shown and nobody is remembered', async () => {
    const { login, alertText } = await fillAndSubmit('crew@fluxwalk.example', 'nope');
    login.flush({ error: { message: 'Wrong e-mail or password.' } }, { status: 401, statusText: 'Unauthorized' });
    expect(await alertText()).toContain('Wrong e-mail or password.');
    expect(localStorage.getItem('fw.session')).toBeNull();
  });

  it('when too many attempts failed, then the wait from Retry-After is explained', async () => {
    const { login, alertText } = await fillAndSubmit('crew@fluxwalk.example', 'nope');
    login.flush(
      { error: { message: 'Too many attempts' } },
      { status: 429, statusText: 'Too Many Requests', headers: { 'Retry-After': '600' } },
    );
    expect(await alertText()).toContain(
      'Too many failed sign-in attempts with this e-mail. To protect the account, signing in is paused — try again in 10 minutes.',
    );
  });

  it('when the account is disabled, then the user is told so', async () => {
    const { login, alertText } = await fillAndSubmit('old@fluxwalk.example', 'fluxwalk-demo');
    login.flush(null, { status: 403, statusText: 'Forbidden' });
    expect(await alertText()).toContain('This account is disabled.');
  });

  it('when there is no connection, then it says offline and why one sign-in needs a connection', async () => {
    const { login, alertText } = await fillAndSubmit('crew@fluxwalk.example', 'fluxwalk-demo');
    login.error(new ProgressEvent('error'), { status: 0, statusText: 'Unknown Error' });
    expect(await alertText()).toContain('You are offline.');
  });
});

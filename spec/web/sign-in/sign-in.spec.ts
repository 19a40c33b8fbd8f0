import { provideHttpClient, withInterceptors } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { Router, provideRouter } from '@angular/router';
import SignIn from '../../../web/app/sign-in/sign-in';
import { apiErrorInterceptor } from '../../../web/app/core/api-error-interceptor';
import { Session } from '../../../web/app/core/session';
import { settle } from '../support/settle';

describe('SignIn', () => {
  let httpTesting: HttpTestingController;

  beforeEach(() => {
    TestBed.configureTestingModule({
      providers: [provideRouter([]), provideHttpClient(withInterceptors([apiErrorInterceptor])), provideHttpClientTesting()],
    });
    httpTesting = TestBed.inject(HttpTestingController);
  });

  afterEach(() => httpTesting.verify());

  it('shows that the e-mail or password is wrong when the API answers 401', async () => {
    const { fixture, loader } = await renderSignedOut();

    await fillIn(loader, 'planner@descentry.example', 'not-the-password');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Sign in' }))).click();
    httpTesting
      .expectOne({ method: 'POST', url: '/api/auth/login' })
      .flush({ error: { code: 'invalid_credentials', message: 'Wrong e-mail or password' } }, { status: 401, statusText: 'Unauthorized' });
    await settle(fixture);

    const error = fixture.nativeElement.querySelector('[data-testid="sign-in-error"]');
    expect(error?.textContent).toContain('The e-mail address or the password is not right');
    expect(TestBed.inject(Session).user()).toBeNull();
  });

  it('says how long to wait when sign-in is rate-limited (429 with Retry-After)', async () => {
    const { fixture, loader } = await renderSignedOut();

    await fillIn(loader, 'planner@descentry.example', 'guess-number-six');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Sign in' }))).click();
    httpTesting
      .expectOne('/api/auth/login')
      .flush(
        { error: { code: 'rate_limited', message: 'Too many attempts' } },
        { status: 429, statusText: 'Too Many Requests', headers: { 'Retry-After': '120' } },
      );
    await settle(fixture);

    const error = fixture.nativeElement.querySelector('[data-testid="sign-in-error"]');
    expect(error?.textContent).toContain('Wait 2 minutes before trying again');
  });

  it('signs in and goes to the return address when the credentials are right', async () => {
    const { fixture, loader } = await renderSignedOut({ returnUrl: '/admin/people' });
    const navigateByUrl = vi.spyOn(TestBed.inject(Router), 'navigateByUrl').mockResolvedValue(true);

    await fillIn(loader, 'Admin@Descentry.example', 'descend-safely-2026');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Sign in' }))).click();
    const request = httpTesting.expectOne('/api/auth/login');
    request.flush({ user: aUser() });
    await settle(fixture);

    expect(request.request.body).toEqual({
      email: 'Admin@Descentry.example',
      password: 'descend-safely-2026',
    });
    expect(TestBed.inject(Session).user()?.name).toBe('Ilse Varga');
    expect(navigateByUrl).toHaveBeenCalledWith('/admin/people');
  });

  it('does not send the form while the e-mail address is missing', async () => {
    const { fixture, loader } = await renderSignedOut();

    await (await loader.getHarness(MatButtonHarness.with({ text: 'Sign in' }))).click();
    await fixture.whenStable();

    httpTesting.expectNone('/api/auth/login');
    expect(fixture.nativeElement.textContent).toContain('Enter your e-mail address.');
  });

  async function renderSignedOut(inputs: { returnUrl?: string } = {}) {
    const fixture = TestBed.createComponent(SignIn);
    if (inputs.returnUrl) fixture.componentRef.setInput('returnUrl', inputs.returnUrl);
    httpTesting.expectOne('/api/auth/session').flush({ user: null });
    await settle(fixture);
    return { fixture, loader: TestbedHarnessEnvironment.loader(fixture) };
  }
});

async function fillIn(loader: ReturnType<typeof TestbedHarnessEnvironment.loader>, email: string, password: string): Promise<void> {
  await (await loader.getHarness(MatInputHarness.with({ selector: '[type="email"]' }))).setValue(email);
  await (await loader.getHarness(MatInputHarness.with({ selector: '[type="password"]' }))).setValue(password);
}

function aUser() {
  return {
    id: '6f1c2a4e-9b7d-4c3e-8a1f-2d5e6b7c8a90',
    email: 'admin@descentry.example',
    name: 'Ilse Varga',
    role: 'admin',
  };
}

import { provideHttpClient, withInterceptors } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { Router, provideRouter } from '@angular/router';
import SetPassword from '../../../web/app/account/set-password';
import { apiErrorInterceptor } from '../../../web/app/core/api-error-interceptor';
import { settle } from '../support/settle';

const TOKEN = 'k3Jd9sPq0vXz7LmN2bYcR5tW';

describe('SetPassword', () => {
  let httpTesting: HttpTestingController;

  beforeEach(() => {
    TestBed.configureTestingModule({
      providers: [provideRouter([]), provideHttpClient(withInterceptors([apiErrorInterceptor])), provideHttpClientTesting()],
    });
    httpTesting = TestBed.inject(HttpTestingController);
  });

  afterEach(() => httpTesting.verify());

  it('explains an expired or used link (410) before asking for a password', async () => {
    const fixture = render('reset');
    httpTesting
      .expectOne({ method: 'POST', url: '/api/auth/token-info' })
      .flush({ error: { code: 'token_expired', message: 'Expired' } }, { status: 410, statusText: 'Gone' });
    await settle(fixture);

    const problem = fixture.nativeElement.querySelector('[data-testid="token-problem"]');
    expect(problem.textContent).toContain('This link has expired or was already used');
    expect(problem.textContent).toContain('Forgot password?');
    expect(fixture.nativeElement.querySelector('input[type="password"]')).toBeNull();
  });

  it('explains an unknown invitation link (404) and who can send a new one', async () => {
    const fixture = render('invite');
    httpTesting
      .expectOne('/api/auth/token-info')
      .flush({ error: { code: 'not_found', message: 'Unknown' } }, { status: 404, statusText: 'Not Found' });
    await settle(fixture);

    const problem = fixture.nativeElement.querySelector('[data-testid="token-problem"]');
    expect(problem.textContent).toContain('This link is not valid');
    expect(problem.textContent).toContain('administrator to send a new invitation');
  });

  it('accepts an invitation with a strong password and goes to sign-in with a message', async () => {
    const fixture = render('invite');
    const tokenInfo = httpTesting.expectOne('/api/auth/token-info');
    tokenInfo.flush({ kind: 'invite', email: 'r.okafor@descentry.example', name: 'Rosa Okafor' });
    await settle(fixture);
    const navigate = vi.spyOn(TestBed.inject(Router), 'navigate').mockResolvedValue(true);
    const loader = TestbedHarnessEnvironment.loader(fixture);

    expect(tokenInfo.request.body).toEqual({ token: TOKEN });
    expect(fixture.nativeElement.textContent).toContain('Welcome, Rosa Okafor.');
    const [password, confirmation] = await loader.getAllHarnesses(MatInputHarness.with({ selector: '[type="password"]' }));
    await password!.setValue('switchback-gravel-ridge');
    await confirmation!.setValue('switchback-gravel-ridge');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Create account' }))).click();
    const accept = httpTesting.expectOne({ method: 'POST', url: '/api/auth/invitations/accept' });
    accept.flush(null, { status: 204, statusText: 'No Content' });
    await settle(fixture);

    expect(accept.request.body).toEqual({ token: TOKEN, password: 'switchback-gravel-ridge' });
    expect(navigate).toHaveBeenCalledWith(['/sign-in'], { queryParams: { notice: 'invitation-accepted' } });
  });

  it('does not send a password the shared rule refuses, and says why', async () => {
    const fixture = render('reset');
    httpTesting.expectOne('/api/auth/token-info').flush({ kind: 'reset', email: 'r.okafor@descentry.example', name: 'Rosa Okafor' });
    await settle(fixture);
    const loader = TestbedHarnessEnvironment.loader(fixture);

    const [password, confirmation] = await loader.getAllHarnesses(MatInputHarness.with({ selector: '[type="password"]' }));
    await password!.setValue('r.okafor-switchback');
    await confirmation!.setValue('r.okafor-switchback');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Save new password' }))).click();
    await settle(fixture);

    httpTesting.expectNone('/api/auth/password-reset/confirm');
    expect(fixture.nativeElement.textContent).toContain('Do not use your e-mail name in the password.');
  });

  function render(kind: 'invite' | 'reset') {
    const fixture = TestBed.createComponent(SetPassword);
    fixture.componentRef.setInput('kind', kind);
    fixture.componentRef.setInput('token', TOKEN);
    fixture.detectChanges();
    return fixture;
  }
});

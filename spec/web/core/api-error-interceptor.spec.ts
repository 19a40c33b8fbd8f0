import { HttpClient, HttpContext, provideHttpClient, withInterceptors } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { MatSnackBar } from '@angular/material/snack-bar';
import { Router, provideRouter } from '@angular/router';
import { firstValueFrom } from 'rxjs';
import { apiErrorInterceptor } from '../../../web/app/core/api-error-interceptor';
import { ERRORS_SHOWN_INLINE } from '../../../web/app/core/api-error-message';
import { Session } from '../../../web/app/core/session';

describe('apiErrorInterceptor', () => {
  let http: HttpClient;
  let httpTesting: HttpTestingController;
  let router: Router;
  let snackBarOpen: ReturnType<typeof vi.fn>;

  beforeEach(() => {
    snackBarOpen = vi.fn();
    TestBed.configureTestingModule({
      providers: [
        provideRouter([]),
        provideHttpClient(withInterceptors([apiErrorInterceptor])),
        provideHttpClientTesting(),
        { provide: MatSnackBar, useValue: { open: snackBarOpen } },
      ],
    });
    http = TestBed.inject(HttpClient);
    httpTesting = TestBed.inject(HttpTestingController);
    router = TestBed.inject(Router);
  });

  afterEach(() => httpTesting.verify());

  it('ends the session and goes to sign-in, keeping the address, when the API answers 401', async () => {
    vi.spyOn(router, 'url', 'get').mockReturnValue('/admin/people?page=2');
    const navigate = vi.spyOn(router, 'navigate').mockResolvedValue(true);
    const clear = vi.spyOn(TestBed.inject(Session), 'clear');

    const result = firstValueFrom(http.get('/api/people'));
    httpTesting.expectOne('/api/people').flush(anError('unauthenticated'), unauthorized);

    await expect(result).rejects.toMatchObject({ status: 401 });
    expect(clear).toHaveBeenCalled();
    expect(navigate).toHaveBeenCalledWith(['/sign-in'], {
      queryParams: { returnUrl: '/admin/people?page=2' },
    });
    expect(snackBarOpen).not.toHaveBeenCalled();
  });

  it('neither redirects nor shows a snack bar for 401 on /api/auth/me', async () => {
    const navigate = vi.spyOn(router, 'navigate');

    const result = firstValueFrom(http.get('/api/auth/me'));
    httpTesting.expectOne('/api/auth/me').flush(anError('unauthenticated'), unauthorized);

    await expect(result).rejects.toMatchObject({ status: 401 });
    expect(navigate).not.toHaveBeenCalled();
    expect(snackBarOpen).not.toHaveBeenCalled();
  });

  it("shows the API's error message in a snack bar for other errors", async () => {
    const result = firstValueFrom(http.patch('/api/people/abc', { role: 'board' }));
    httpTesting
      .expectOne('/api/people/abc')
      .flush(
        { error: { code: 'conflict', message: 'An administrator cannot remove their own role.' } },
        { status: 409, statusText: 'Conflict' },
      );

    await expect(result).rejects.toMatchObject({ status: 409 });
    expect(snackBarOpen).toHaveBeenCalledWith('An administrator cannot remove their own role.', 'Dismiss');
  });

  it('leaves errors to the caller when the request says it shows them inline', async () => {
    const context = new HttpContext().set(ERRORS_SHOWN_INLINE, true);

    const result = firstValueFrom(http.post('/api/people', {}, { context }));
    httpTesting.expectOne('/api/people').flush(anError('conflict'), { status: 409, statusText: 'Conflict' });

    await expect(result).rejects.toMatchObject({ status: 409 });
    expect(snackBarOpen).not.toHaveBeenCalled();
  });

  it('explains an unreachable server', async () => {
    const result = firstValueFrom(http.get('/api/mail/outbox'));
    httpTesting.expectOne('/api/mail/outbox').error(new ProgressEvent('error'), { status: 0 });

    await expect(result).rejects.toMatchObject({ status: 0 });
    expect(snackBarOpen).toHaveBeenCalledWith(expect.stringContaining('cannot be reached'), 'Dismiss');
  });
});

const unauthorized = { status: 401, statusText: 'Unauthorized' };

function anError(code: string) {
  return { error: { code, message: `Failed: ${code}` } };
}

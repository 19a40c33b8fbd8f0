import { HttpErrorResponse, type HttpInterceptorFn } from '@angular/common/http';
import { inject } from '@angular/core';
import { MatSnackBar } from '@angular/material/snack-bar';
import { Router } from '@angular/router';
import { catchError, throwError } from 'rxjs';
import { ERRORS_SHOWN_INLINE, describeApiError } from './api-error-message';
import { Session } from './session';

/** Answers 401 by design: "nobody is signed in" and "wrong password", not "session expired". */
const ENDPOINTS_WHERE_401_IS_AN_ANSWER = ['/api/auth/me', '/api/auth/login'];

/**
 * Turns failed API calls into something a person can see: a 401 ends the local session and goes
 * to the sign-in page (remembering where the person was), other errors appear in a snack bar
 * unless the caller shows them inline. The error is always passed on to the caller.
 */
export const apiErrorInterceptor: HttpInterceptorFn = (request, next) => {
  const router = inject(Router);
  const snackBar = inject(MatSnackBar);
  const session = inject(Session);

  return next(request).pipe(
    catchError((error: unknown) => {
      if (!(error instanceof HttpErrorResponse)) return throwError(() => error);
      const path = new URL(request.url, 'http://descentry.invalid').pathname;

      if (error.status === 401 && !ENDPOINTS_WHERE_401_IS_AN_ANSWER.includes(path)) {
        if (!request.context.get(ERRORS_SHOWN_INLINE)) {
          session.clear();
          sendToSignIn(router);
        }
      } else if (!request.context.get(ERRORS_SHOWN_INLINE) && error.status !== 401) {
        snackBar.open(describeApiError(error), 'Dismiss');
      }
      return throwError(() => error);
    }),
  );
};

function sendToSignIn(router: Router): void {
  const currentUrl = router.url;
  if (currentUrl.startsWith('/sign-in')) return;
  const returnUrl = currentUrl === '/' ? undefined : currentUrl;
  void router.navigate(['/sign-in'], { queryParams: { returnUrl } });
}

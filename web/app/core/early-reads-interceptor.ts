import { HttpErrorResponse, HttpResponse, type HttpEvent, type HttpInterceptorFn } from '@angular/common/http';
import { Observable, from, of, switchMap, throwError } from 'rxjs';
import { forgetEarlyReads, takeEarlyRead } from './early-reads';

/**
 * Answers a page's GET from the read started ahead of it for the same address (once; the next
 * request for it goes to the API), with the same status and body the API gave, so an error reaches
 * the page and the error interceptor exactly as if the page had asked. Anything else — another
 * method, a non-JSON request, an address not read ahead, a read too old, a read that got no answer
 * — goes to the API. A change (any other method) drops every early answer not yet taken: it may
 * describe what the change altered. Sits last among the interceptors, next to the network.
 */
export const earlyReadsInterceptor: HttpInterceptorFn = (request, next) => {
  if (request.method !== 'GET') {
    forgetEarlyReads();
    return next(request);
  }
  if (request.responseType !== 'json') return next(request);
  const url = request.urlWithParams;
  const early = takeEarlyRead(url);
  if (!early) return next(request);
  return from(early).pipe(
    switchMap((answer): Observable<HttpEvent<unknown>> => {
      if (answer === null) return next(request);
      if (answer.status >= 200 && answer.status < 300) {
        return of(new HttpResponse({ body: answer.body, status: answer.status, statusText: answer.statusText, url }));
      }
      return throwError(() => new HttpErrorResponse({ error: answer.body, status: answer.status, statusText: answer.statusText, url }));
    }),
  );
};

import { HttpClient, provideHttpClient, withInterceptors } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { firstValueFrom } from 'rxjs';
import { EARLY_READ_LIFETIME_MS, forgetEarlyReads, readEarly } from '../../../web/app/core/early-reads';
import { earlyReadsInterceptor } from '../../../web/app/core/early-reads-interceptor';

/** A fetch that answers each address with the given status and JSON body, counting the calls. */
function fakeFetch(answers: Record<string, { status: number; body: unknown } | 'network-down'>) {
  const calls: string[] = [];
  const fetchFn = vi.fn(async (url: string) => {
    calls.push(url);
    const answer = answers[url];
    if (!answer || answer === 'network-down') throw new TypeError('Failed to fetch');
    return new Response(JSON.stringify(answer.body), { status: answer.status, statusText: answer.status === 200 ? 'OK' : 'Not Found' });
  });
  vi.stubGlobal('fetch', fetchFn);
  return calls;
}

describe('early reads', () => {
  let http: HttpClient;
  let httpTesting: HttpTestingController;

  beforeEach(() => {
    forgetEarlyReads();
    TestBed.configureTestingModule({
      providers: [provideHttpClient(withInterceptors([earlyReadsInterceptor])), provideHttpClientTesting()],
    });
    http = TestBed.inject(HttpClient);
    httpTesting = TestBed.inject(HttpTestingController);
  });

  afterEach(() => {
    httpTesting.verify();
    vi.unstubAllGlobals();
    vi.useRealTimers();
  });

  it('asks once per address and gives the body of a successful answer, null otherwise', async () => {
    const calls = fakeFetch({
      '/api/a': { status: 200, body: { id: 'a' } },
      '/api/missing': { status: 404, body: { error: { code: 'not_found' } } },
    });
    expect(await readEarly('/api/a')).toEqual({ id: 'a' });
    expect(await readEarly('/api/a')).toEqual({ id: 'a' });
    expect(await readEarly('/api/missing')).toBeNull();
    expect(calls).toEqual(['/api/a', '/api/missing']);
  });

  it('answers the page’s GET for the same address from the early read, once', async () => {
    const calls = fakeFetch({ '/api/scenarios/s1/result?profileStepM=25&series=lon,lat': { status: 200, body: { rows: [1, 2] } } });
    void readEarly('/api/scenarios/s1/result?profileStepM=25&series=lon,lat');

    const first = await firstValueFrom(http.get('/api/scenarios/s1/result', { params: { profileStepM: 25, series: 'lon,lat' } }));
    expect(first).toEqual({ rows: [1, 2] });
    httpTesting.expectNone(() => true);

    // The next request for it goes to the API: an early answer is handed over once.
    const second = firstValueFrom(http.get('/api/scenarios/s1/result?profileStepM=25&series=lon,lat'));
    httpTesting.expectOne('/api/scenarios/s1/result?profileStepM=25&series=lon,lat').flush({ rows: [3] });
    expect(await second).toEqual({ rows: [3] });
    expect(calls).toHaveLength(1);
  });

  it('hands an error status to the page as the API gave it, without asking again', async () => {
    fakeFetch({ '/api/routes/r1': { status: 404, body: { error: { code: 'not_found', message: 'No such route' } } } });
    void readEarly('/api/routes/r1');

    await expect(firstValueFrom(http.get('/api/routes/r1'))).rejects.toMatchObject({
      status: 404,
      error: { error: { code: 'not_found', message: 'No such route' } },
    });
    httpTesting.expectNone('/api/routes/r1');
  });

  it('lets the page ask the API itself when the early read got no answer', async () => {
    fakeFetch({ '/api/terrain': 'network-down' });
    void readEarly('/api/terrain');

    const page = firstValueFrom(http.get('/api/terrain'));
    await vi.waitFor(() => httpTesting.expectOne('/api/terrain').flush({ models: [] }));
    expect(await page).toEqual({ models: [] });
  });

  it('goes to the API for another query string, an old early read, or after a change', async () => {
    fakeFetch({
      '/api/x?step=25': { status: 200, body: 'early' },
      '/api/old': { status: 200, body: 'early' },
      '/api/changed': { status: 200, body: 'early' },
    });
    void readEarly('/api/x?step=25');
    const other = firstValueFrom(http.get('/api/x?step=50'));
    httpTesting.expectOne('/api/x?step=50').flush('api');
    expect(await other).toBe('api');

    vi.useFakeTimers({ toFake: ['Date'] });
    void readEarly('/api/old');
    vi.setSystemTime(Date.now() + EARLY_READ_LIFETIME_MS + 1);
    const old = firstValueFrom(http.get('/api/old'));
    httpTesting.expectOne('/api/old').flush('api');
    expect(await old).toBe('api');
    vi.useRealTimers();

    void readEarly('/api/changed');
    const save = firstValueFrom(http.put('/api/changed', { name: 'new' }));
    httpTesting.expectOne((request) => request.method === 'PUT').flush({});
    await save;
    const after = firstValueFrom(http.get('/api/changed'));
    httpTesting.expectOne('/api/changed').flush('api');
    expect(await after).toBe('api');
  });
});

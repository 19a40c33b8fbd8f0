import { provideHttpClient } from '@angular/common/http';
import { HttpEventType } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import type { TerrainModel } from '@shared/domain/terrain';
import { terrainModel } from '../support/terrain-model';
import { TerrainUpload } from '../../../web/app/terrain/terrain-upload';
import { settle } from '../support/settle';

describe('TerrainUpload', () => {
  let httpTesting: HttpTestingController;

  beforeEach(() => {
    TestBed.configureTestingModule({ providers: [provideHttpClient(), provideHttpClientTesting()] });
    httpTesting = TestBed.inject(HttpTestingController);
  });

  afterEach(() => {
    vi.useRealTimers();
    httpTesting.verify();
  });

  it('shows upload progress, then processing, then the ready model', async () => {
    vi.useFakeTimers({ shouldAdvanceTime: true });
    const fixture = await render();
    const finished: TerrainModel[] = [];
    fixture.componentInstance.ingestionFinished.subscribe((model) => finished.push(model));
    pickFile(fixture, new File([new Uint8Array(2000)], 'korvel-valley.tif', { type: 'image/tiff' }));
    await settle(fixture);
    expect(nameInput(fixture).value).toBe('korvel-valley');

    button(fixture, 'Upload').click();
    const upload = httpTesting.expectOne('/api/terrain');
    expect(upload.request.method).toBe('POST');
    expect((upload.request.body as FormData).get('name')).toBe('korvel-valley');
    upload.event({ type: HttpEventType.UploadProgress, loaded: 500, total: 2000 });
    await settle(fixture);
    expect(text(fixture)).toContain('Uploading… 25 %');

    upload.flush({ id: MODEL.id, status: 'processing' }, { status: 201, statusText: 'Created' });
    await settle(fixture);
    expect(text(fixture)).toContain('Checking the grid');

    await vi.advanceTimersByTimeAsync(1600);
    httpTesting.expectOne(`/api/terrain/${MODEL.id}`).flush(MODEL);
    await settle(fixture);

    expect(text(fixture)).toContain('“Korvel valley” is ready.');
    expect(finished.map((model) => model.id)).toEqual([MODEL.id]);
    // The same file is not offered for a second upload (issue 10); "Upload another" starts over.
    expect(button(fixture, 'Upload').disabled).toBe(true);
  });

  it('shows the reason the server gives when it refuses a file', async () => {
    const fixture = await render();
    pickFile(fixture, new File(['<gpx/>'], 'route.gpx'));
    await settle(fixture);

    button(fixture, 'Upload').click();
    httpTesting
      .expectOne('/api/terrain')
      .flush({ error: { code: 'not_a_tiff', message: 'The file is not a TIFF' } }, { status: 415, statusText: 'Unsupported Media Type' });
    await settle(fixture);

    expect(fixture.nativeElement.querySelector('[role="alert"]').textContent).toContain('The file is not a TIFF');
  });
});

const MODEL = terrainModel();

async function render(): Promise<ComponentFixture<TerrainUpload>> {
  const fixture = TestBed.createComponent(TerrainUpload);
  await fixture.whenStable();
  return fixture;
}

function pickFile(fixture: ComponentFixture<TerrainUpload>, file: File): void {
  const input = fixture.nativeElement.querySelector('[data-testid="terrain-file-input"]') as HTMLInputElement;
  Object.defineProperty(input, 'files', { value: [file], configurable: true });
  input.dispatchEvent(new Event('change'));
}

function nameInput(fixture: ComponentFixture<TerrainUpload>): HTMLInputElement {
  return fixture.nativeElement.querySelector('input[matInput]') as HTMLInputElement;
}

function button(fixture: ComponentFixture<TerrainUpload>, label: string): HTMLButtonElement {
  const buttons = [...fixture.nativeElement.querySelectorAll('button')] as HTMLButtonElement[];
  return buttons.find((b) => b.textContent?.trim().endsWith(label))!;
}

function text(fixture: ComponentFixture<TerrainUpload>): string {
  return (fixture.nativeElement as HTMLElement).textContent ?? '';
}

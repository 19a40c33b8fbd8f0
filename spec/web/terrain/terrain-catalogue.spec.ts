import { CUSTOM_ELEMENTS_SCHEMA } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { MatDialog } from '@angular/material/dialog';
import { MatSnackBar } from '@angular/material/snack-bar';
import type { TerrainList, TerrainModel } from '@shared/domain/terrain';
import { TerrainMap } from '../../../web/app/map/terrain-map';
import TerrainCatalogue from '../../../web/app/terrain/terrain-catalogue';
import { TerrainApi } from '../../../web/app/terrain/terrain-api';
import { TerrainUpload } from '../../../web/app/terrain/terrain-upload';
import { settle } from '../support/settle';
import { terrainModel } from '../support/terrain-model';

/** A catalogue API whose list answers wait until the test gives them. */
class HeldTerrainApi {
  readonly answers: Array<(list: TerrainList) => void> = [];
  list = vi.fn(() => new Promise<TerrainList>((resolve) => this.answers.push(resolve)));
  delete = vi.fn(async () => undefined);
}

describe('TerrainCatalogue', () => {
  it('never shows a deleted model again because a list asked for before the deletion answered after it', async () => {
    const api = new HeldTerrainApi();
    TestBed.configureTestingModule({
      providers: [
        { provide: TerrainApi, useValue: api },
        { provide: MatDialog, useValue: {} },
        { provide: MatSnackBar, useValue: { open: vi.fn() } },
      ],
    });
    // The map and the upload panel are not what this is about (and the map needs a real layout).
    TestBed.overrideComponent(TerrainCatalogue, {
      remove: { imports: [TerrainMap, TerrainUpload] },
      add: { schemas: [CUSTOM_ELEMENTS_SCHEMA] },
    });
    const fixture = TestBed.createComponent(TerrainCatalogue);
    const first = model('Korvel valley', 'processing');
    const other = model('Orren slope', 'ready', '5c1e2d4e-8a57-4a55-9f7c-3a1d2c3b4a5f');
    api.answers.shift()!(list([first, other]));
    await settle(fixture);
    expect(rowNames(fixture.nativeElement)).toEqual(['Korvel valley', 'Orren slope']);

    // A refresh (the model is processing) is under way when the person deletes the model.
    (fixture.componentInstance as unknown as { load(): Promise<void> }).load();
    const deletion = (fixture.componentInstance as unknown as { delete(m: TerrainModel, force: boolean): Promise<void> }).delete(
      first,
      false,
    );
    await deletion;
    await settle(fixture);
    expect(rowNames(fixture.nativeElement)).toEqual(['Orren slope']);

    // The refresh answers with the list as it was before the deletion: it is dropped…
    api.answers.shift()!(list([first, other]));
    await settle(fixture);
    expect(rowNames(fixture.nativeElement)).toEqual(['Orren slope']);
    // …and the list asked for after the deletion is shown.
    api.answers.shift()!(list([other]));
    await settle(fixture);
    expect(rowNames(fixture.nativeElement)).toEqual(['Orren slope']);
    expect(api.delete).toHaveBeenCalledWith(first.id, false);
  });
});

function rowNames(root: HTMLElement): string[] {
  return [...root.querySelectorAll('td.mat-column-name')].map((cell) => cell.textContent!.trim());
}

function list(items: TerrainModel[]): TerrainList {
  return { items, tilesVersion: 'v1' } as TerrainList;
}

function model(name: string, status: TerrainModel['status'], id = '2b0f2d4e-8a57-4a55-9f7c-3a1d2c3b4a5e'): TerrainModel {
  return terrainModel({
    id,
    name,
    status,
    qualityNotes: [],
    footprint: null,
    readyAt: status === 'ready' ? '2026-06-01T08:00:05.000Z' : null,
  });
}

import { HttpClient, HttpContext } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { profileSchema } from '@shared/domain/analysis';
import {
  directionResultSchema,
  scenarioComparisonSchema,
  scenarioListSchema,
  scenarioResultSchema,
  scenarioSchema,
  type Scenario,
  type ScenarioComparison,
  type ScenarioDraftInput,
} from '@shared/domain/scenarios';
import { firstValueFrom } from 'rxjs';
import * as z from 'zod';
import { ERRORS_SHOWN_INLINE } from '../core/api-error-message';
import { RESULT_SCREEN_SERIES, scenarioPath, scenarioResultScreenPath } from './scenario-paths';

export type ScenarioExportKind = 'csv' | 'geojson' | 'pdf';

const resultScreenSchema = scenarioResultSchema.extend({
  directions: z
    .array(
      directionResultSchema.extend({
        profile: profileSchema.pick({
          distanceM: true,
          ...(Object.fromEntries(RESULT_SCREEN_SERIES.map((name) => [name, true])) as Record<(typeof RESULT_SCREEN_SERIES)[number], true>),
        }),
      }),
    )
    .min(1),
});
/** A scenario's result as the result screen asks for it (the series it draws, thinned). */
export type ResultScreenData = z.infer<typeof resultScreenSchema>;
export type ResultScreenDirection = ResultScreenData['directions'][number];

const inline = () => ({ context: new HttpContext().set(ERRORS_SHOWN_INLINE, true) });

/** Scenarios, their runs and results; every answer is parsed with the shared schemas. */
@Injectable({ providedIn: 'root' })
export class ScenariosApi {
  private readonly http = inject(HttpClient);

  async list(filter: { routeId?: string; vehicleProfileId?: string } = {}): Promise<Scenario[]> {
    const params: Record<string, string> = {};
    if (filter.routeId) params['routeId'] = filter.routeId;
    if (filter.vehicleProfileId) params['vehicleProfileId'] = filter.vehicleProfileId;
    return scenarioListSchema.parse(await firstValueFrom(this.http.get('/api/scenarios', { params }))).items;
  }

  async get(scenarioId: string): Promise<Scenario> {
    return scenarioSchema.parse(await firstValueFrom(this.http.get(scenarioPath(scenarioId))));
  }

  async create(draft: ScenarioDraftInput): Promise<Scenario> {
    return scenarioSchema.parse(await firstValueFrom(this.http.post('/api/scenarios', draft, inline())));
  }

  async update(scenarioId: string, draft: ScenarioDraftInput): Promise<Scenario> {
    return scenarioSchema.parse(await firstValueFrom(this.http.put(scenarioPath(scenarioId), draft, inline())));
  }

  async remove(scenarioId: string): Promise<void> {
    await firstValueFrom(this.http.delete(scenarioPath(scenarioId)));
  }

  /** Starts (or restarts) a run; answers the scenario with its new status. */
  async run(scenarioId: string): Promise<Scenario> {
    return scenarioSchema.parse(await firstValueFrom(this.http.post(`${scenarioPath(scenarioId)}/run`, null, inline())));
  }

  /** The stored result with the per-point series the result screen draws, thinned for its charts. */
  async result(scenarioId: string): Promise<ResultScreenData> {
    return resultScreenSchema.parse(await firstValueFrom(this.http.get(scenarioResultScreenPath(scenarioId), inline())));
  }

  async compare(scenarioIds: readonly string[]): Promise<ScenarioComparison> {
    const body = await firstValueFrom(this.http.get('/api/scenarios/compare', { params: { ids: scenarioIds.join(',') } }));
    return scenarioComparisonSchema.parse(body);
  }

  /** Download address of a scenario export. */
  exportUrl(scenarioId: string, kind: ScenarioExportKind): string {
    const file = kind === 'csv' ? 'export.csv' : kind === 'geojson' ? 'export.geojson' : 'report.pdf';
    return `${scenarioPath(scenarioId)}/${file}`;
  }
}

/**
 * Download address of the descent cards (one A4 page per descent); with a direction and a point
 * along the route, only the descent there.
 */
export function descentCardsUrl(scenarioId: string, at?: { direction: 'outbound' | 'inbound'; atM: number }): string {
  const base = `${scenarioPath(scenarioId)}/descent-cards.pdf`;
  return at ? `${base}?direction=${at.direction}&atM=${Math.round(at.atM)}` : base;
}

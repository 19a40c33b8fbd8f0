import { HttpClient, HttpContext } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import {
  gtfsBlocksAnswerSchema,
  gtfsServicesAnswerSchema,
  serviceDayListSchema,
  serviceDayResultSchema,
  serviceDaySchema,
  type ServiceDay,
  type ServiceDayDraftInput,
  type ServiceDayResult,
} from '@shared/domain/service-days';
import type * as z from 'zod';
import { firstValueFrom } from 'rxjs';
import { ERRORS_SHOWN_INLINE } from '../core/api-error-message';

export type ServiceDaySummary = z.infer<typeof serviceDayListSchema>['items'][number];
export type ServiceDayExportKind = 'csv' | 'pdf';
export type GtfsService = z.infer<typeof gtfsServicesAnswerSchema>['services'][number];
export type GtfsBlocksAnswer = z.infer<typeof gtfsBlocksAnswerSchema>;

const inline = () => ({ context: new HttpContext().set(ERRORS_SHOWN_INLINE, true) });

/** Service days, their runs and results at `/api/service-days`; every answer is parsed with the shared schemas. */
@Injectable({ providedIn: 'root' })
export class ServiceDaysApi {
  private readonly http = inject(HttpClient);

  async list(): Promise<ServiceDaySummary[]> {
    return serviceDayListSchema.parse(await firstValueFrom(this.http.get('/api/service-days'))).items;
  }

  async get(serviceDayId: string): Promise<ServiceDay> {
    return serviceDaySchema.parse(await firstValueFrom(this.http.get(serviceDayPath(serviceDayId))));
  }

  async create(draft: ServiceDayDraftInput): Promise<ServiceDay> {
    return serviceDaySchema.parse(await firstValueFrom(this.http.post('/api/service-days', draft, inline())));
  }

  async update(serviceDayId: string, draft: ServiceDayDraftInput): Promise<ServiceDay> {
    return serviceDaySchema.parse(await firstValueFrom(this.http.put(serviceDayPath(serviceDayId), draft, inline())));
  }

  async remove(serviceDayId: string): Promise<void> {
    await firstValueFrom(this.http.delete(serviceDayPath(serviceDayId)));
  }

  /** Queues a run (or a re-run); the answer is the service day with its new status. */
  async run(serviceDayId: string): Promise<ServiceDay> {
    return serviceDaySchema.parse(await firstValueFrom(this.http.post(`${serviceDayPath(serviceDayId)}/run`, null, inline())));
  }

  async result(serviceDayId: string): Promise<ServiceDayResult> {
    return serviceDayResultSchema.parse(await firstValueFrom(this.http.get(`${serviceDayPath(serviceDayId)}/result`, inline())));
  }

  /** The service_ids of a GTFS feed with their trips and blocks; nothing is saved. */
  async gtfsServices(file: File): Promise<GtfsService[]> {
    const form = new FormData();
    form.append('file', file, file.name);
    return gtfsServicesAnswerSchema.parse(await firstValueFrom(this.http.post('/api/service-days/gtfs-services', form, inline()))).services;
  }

  /** The blocks of one service of a GTFS feed, on saved routes, for the draft; nothing is saved. */
  async gtfsBlocks(
    file: File,
    options: { serviceId: string; vehicleProfileId: string; depotChargerKey?: string | undefined },
  ): Promise<GtfsBlocksAnswer> {
    const form = new FormData();
    form.append('serviceId', options.serviceId);
    form.append('vehicleProfileId', options.vehicleProfileId);
    if (options.depotChargerKey) form.append('depotChargerKey', options.depotChargerKey);
    form.append('file', file, file.name);
    return gtfsBlocksAnswerSchema.parse(await firstValueFrom(this.http.post('/api/service-days/gtfs-blocks', form, inline())));
  }

  /** Download address of an export of the stored result. */
  exportUrl(serviceDayId: string, kind: ServiceDayExportKind): string {
    return `${serviceDayPath(serviceDayId)}/${kind === 'csv' ? 'result.csv' : 'report.pdf'}`;
  }
}

export function serviceDayPath(serviceDayId: string): string {
  return `/api/service-days/${encodeURIComponent(serviceDayId)}`;
}

import { serviceDayIdParamsSchema } from '@shared/domain/service-days';
import type { AppDeps } from '../app-deps';
import { sendAttachment } from '../http/attachment';
import { endpoint } from '../http/endpoint';
import { serviceDayReportPdf } from '../pdf/service-day-report-pdf';
import * as routes from '../road-routes/road-routes-repository';
import * as service from './service-days-service';

/** The service day's printable report (the CSV and the rest of the API are in service-days-endpoints.ts). */
export function serviceDayReportEndpoints(deps: AppDeps) {
  return [
    endpoint({
      method: 'get',
      path: '/api/service-days/:serviceDayId/report.pdf',
      summary:
        'PDF report of the last run: blocks that cannot be worked and why, SOC chart, charging, peak charger power, descents the day made riskier, cautions',
      tag: 'Service days',
      access: 'signed-in',
      heavy: true,
      params: serviceDayIdParamsSchema,
      responses: {
        200: { description: 'PDF (attachment)', contentType: 'application/pdf' },
        404: { description: 'No such service day, or never run' },
      },
      handler: async ({ params, res }) => {
        const day = await service.getServiceDay(deps.db, params.serviceDayId);
        const result = await service.getResult(deps.db, params.serviceDayId);
        const names = new Map<string, string>();
        for (const routeId of new Set(day.blocks.flatMap((block) => block.trips.map((trip) => trip.routeId)))) {
          const route = await routes.findRoute(deps.db, routeId);
          const version = route ? await routes.findVersion(deps.db, routeId, route.currentVersion) : undefined;
          if (version) names.set(routeId, version.name);
        }
        const pdf = await serviceDayReportPdf(day, result, names);
        sendAttachment(res, day.name, 'pdf', 'application/pdf', pdf);
      },
    }),
  ];
}

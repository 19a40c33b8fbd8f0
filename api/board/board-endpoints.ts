import { rolesWith } from '@shared/domain/permissions';
import { boardSummarySchema, networkSettingsUpdateSchema, networkSettingsViewSchema } from '@shared/domain/board-summary';
import type { AppDeps } from '../app-deps';
import { endpoint } from '../http/endpoint';
import { renderBoardSummaryPdf } from './board-summary-pdf';
import { boardSummary } from './board-summary-service';
import { readNetworkSettings, saveNetworkSettings } from './network-settings';

export function boardEndpoints(deps: AppDeps) {
  return [
    endpoint({
      method: 'get',
      path: '/api/board/summary',
      summary: 'Network summary: yearly regeneration, its value and CO₂, friction-brake energy, open safety items',
      tag: 'Board',
      access: 'signed-in',
      responses: { 200: { description: 'The summary', schema: boardSummarySchema } },
      handler: async ({ res }) => {
        res.json(await boardSummary(deps.db));
      },
    }),
    endpoint({
      method: 'get',
      path: '/api/board/summary.pdf',
      summary: 'The network summary as a printable one-page PDF',
      tag: 'Board',
      access: 'signed-in',
      heavy: true,
      responses: { 200: { description: 'A4 PDF', contentType: 'application/pdf' } },
      handler: async ({ res }) => {
        const summary = await boardSummary(deps.db);
        const pdf = await renderBoardSummaryPdf(summary);
        res
          .status(200)
          .type('application/pdf')
          .set('Content-Disposition', `inline; filename="descentry-network-summary-${summary.generatedAt.slice(0, 10)}.pdf"`)
          .send(pdf);
      },
    }),
    endpoint({
      method: 'get',
      path: '/api/settings/network',
      summary: 'Money and CO₂ factors of the board summary, with their sources',
      tag: 'Board',
      access: 'signed-in',
      responses: { 200: { description: 'Settings', schema: networkSettingsViewSchema } },
      handler: async ({ res }) => {
        res.json(await readNetworkSettings(deps.db));
      },
    }),
    endpoint({
      method: 'put',
      path: '/api/settings/network',
      summary: 'Set the tariff and the grid emission factor with their sources, and the safety settings (left out: kept)',
      tag: 'Board',
      access: rolesWith('network-settings.edit'),
      body: networkSettingsUpdateSchema,
      responses: { 200: { description: 'Saved settings', schema: networkSettingsViewSchema } },
      handler: async ({ body, user, res }) => {
        res.json(await saveNetworkSettings(deps.db, user!, body));
      },
    }),
  ];
}

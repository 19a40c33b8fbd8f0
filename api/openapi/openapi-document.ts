import { OpenAPIRegistry, OpenApiGeneratorV31 } from '@asteasolutions/zod-to-openapi';
import { z } from 'zod';
import { apiErrorSchema } from '@shared/domain/api-error';
import { ROLES } from '@shared/domain/roles';
import { rolesFor, type AnyEndpoint } from '../http/endpoint';

/**
 * Builds the OpenAPI 3.1 document from the same endpoint definitions that are mounted, so the
 * document cannot drift from the API. Each operation carries `x-access` (public or the roles).
 */
export function buildOpenApiDocument(endpoints: readonly AnyEndpoint[]) {
  const registry = new OpenAPIRegistry();
  registry.registerComponent('securitySchemes', 'session', {
    type: 'apiKey',
    in: 'cookie',
    name: 'descentry_session',
  });
  for (const definition of endpoints) {
    const access = rolesFor(definition.access, ROLES);
    const responses: Record<string, { description: string; content?: Record<string, { schema: z.ZodType }> }> = {};
    for (const [status, answer] of Object.entries(definition.responses)) {
      responses[status] = {
        description: answer.description,
        ...(answer.schema
          ? { content: { [answer.contentType ?? 'application/json']: { schema: answer.schema } } }
          : answer.contentType
            ? { content: { [answer.contentType]: { schema: z.string() } } }
            : {}),
      };
    }
    if (definition.revalidated) responses['304'] ??= { description: 'Unchanged since the ETag named in If-None-Match (no body)' };
    responses['4XX'] = {
      description: 'Error: `{ error: { code, message, details? } }`',
      content: { 'application/json': { schema: apiErrorSchema } },
    };
    registry.registerPath({
      method: definition.method,
      path: definition.path.replace(/:(\w+)/g, '{$1}'),
      summary: definition.summary,
      tags: [definition.tag],
      ...(access === 'public' ? {} : { security: [{ session: [] }] }),
      'x-access': access,
      request: {
        ...(definition.params ? { params: definition.params as z.ZodObject } : {}),
        ...(definition.query ? { query: definition.query as z.ZodObject } : {}),
        ...(definition.body
          ? { body: { content: { 'application/json': { schema: definition.body } } } }
          : definition.multipartBody
            ? { body: { content: { 'multipart/form-data': { schema: definition.multipartBody } } } }
            : {}),
      },
      responses,
    } as Parameters<OpenAPIRegistry['registerPath']>[0]);
  }
  return new OpenApiGeneratorV31(registry.definitions).generateDocument({
    openapi: '3.1.0',
    info: {
      title: 'Descentry API',
      version: '1',
      description:
        'Braking-energy recovery and brake-fade risk on mountain transit routes. JSON, SI units. ' +
        'Sign in with POST /api/auth/login; the session travels in an HttpOnly cookie.',
    },
  });
}

import type { Request, RequestHandler, Response, Router } from 'express';
import type { z } from 'zod';
import type { Role } from '@shared/domain/roles';
import type { User } from '@shared/domain/auth';
import { requireRole, type Access } from '../auth/require-role';
import { answerByIdentity, revalidatedAnswer, type AnswerIdentity } from './answer-validator';
import type { BuiltAnswers } from './built-answers';

type HttpMethod = 'get' | 'post' | 'put' | 'patch' | 'delete';

export interface EndpointResponse {
  description: string;
  /** JSON body schema; omit for empty answers (204) or non-JSON content. */
  schema?: z.ZodType;
  /** Non-JSON content such as image/png or text/csv. */
  contentType?: string;
}

export interface EndpointInput<TBody, TQuery, TParams> {
  body: TBody;
  query: TQuery;
  params: TParams;
  /** The signed-in person; undefined only on public endpoints. */
  user: User | undefined;
  req: Request;
  res: Response;
}

/**
 * One API endpoint: its path, who may call it, its input schemas and its answers. The same
 * definition mounts the Express handler (behind `requireRole`) and documents the endpoint in the
 * OpenAPI document, so no endpoint exists without an access rule and a description.
 */
export interface Endpoint<TBody = unknown, TQuery = unknown, TParams = unknown> {
  method: HttpMethod;
  /** Express-style path, e.g. `/api/people/:personId`. */
  path: string;
  summary: string;
  tag: string;
  access: Access;
  body?: z.ZodType<TBody>;
  /** Documents a multipart/form-data body (parsed by `middleware`, e.g. multer). */
  multipartBody?: z.ZodType;
  query?: z.ZodType<TQuery>;
  params?: z.ZodType<TParams>;
  responses: Record<number, EndpointResponse>;
  /** Runs after the access check and before input parsing (uploads, for instance). */
  middleware?: RequestHandler[];
  /**
   * Whether the endpoint does heavy work (an analysis, an import, an upload, a report): each
   * person may have only a few such requests in flight at once (HEAVY_REQUESTS_PER_PERSON).
   */
  heavy?: boolean;
  /**
   * The answer may be kept in the process's answer cache (api/http/answer-cache.ts) until a write
   * anywhere changes the data: only for reads whose answer depends on nothing but the address and
   * the caller's role (the busy lists).
   */
  cachedAnswer?: boolean;
  /**
   * The browser may keep the answer and must ask before each use (api/http/answer-validator.ts):
   * an ETag made from the answer's JSON, `private, no-cache`, and 304 without a body while the
   * answer is unchanged. For reads a page makes on every visit whose answer changes rarely (a
   * stored result, a route, the catalogues behind the map); not together with `cachedAnswer`.
   */
  revalidated?: boolean;
  /**
   * With `revalidated`, for answers that cost real work to build (a stored result): what the
   * answer depends on, read without building it (the rows' versions, the query's choices);
   * undefined when there is no such item. The ETag is then made from it (with the endpoint, the
   * caller's role and the server's code version) instead of from the built answer, so a 304 costs
   * this lookup only, and the built answer is kept in the process's BuiltAnswers under its ETag
   * (api/http/answer-validator.ts, `answerByIdentity`). The identity must change with everything
   * the answer shows for a role; an answer that differs per person cannot have one.
   */
  answerIdentity?: (input: EndpointInput<TBody, TQuery, TParams>) => Promise<AnswerIdentity | undefined>;
  /**
   * With `answerIdentity`: every role is shown the very same answer, so the caller's role is left
   * out of the ETag. By default it is part of it.
   */
  answerSameForEveryRole?: boolean;
  handler: (input: EndpointInput<TBody, TQuery, TParams>) => Promise<void> | void;
}

/** Helper that keeps each endpoint's input types inferred from its schemas. */
export function endpoint<TBody = undefined, TQuery = undefined, TParams = undefined>(
  definition: Endpoint<TBody, TQuery, TParams>,
): Endpoint<TBody, TQuery, TParams> {
  return definition;
}

// Endpoints of every input type live in one list; their handlers are only called with parsed input.
// eslint-disable-next-line @typescript-eslint/no-explicit-any
export type AnyEndpoint = Endpoint<any, any, any>;

export interface MountOptions {
  /** Guards endpoints marked `heavy`. */
  heavyRequests?: { middleware(): RequestHandler };
  /** The path the router is mounted at (e.g. `/api`): cut from the endpoint's documented path. */
  mountedAt?: string;
  /** Answers endpoints marked `cachedAnswer` from memory while nothing has changed. */
  answerCache?: { serve(): RequestHandler };
  /** Keeps the built answers of endpoints with an `answerIdentity`. */
  builtAnswers?: BuiltAnswers;
}

export function mountEndpoint(router: Router, definition: AnyEndpoint, options: MountOptions = {}): void {
  const handler: RequestHandler = async (req, res) => {
    const input: EndpointInput<unknown, unknown, unknown> = {
      params: definition.params ? definition.params.parse(req.params) : req.params,
      query: definition.query ? definition.query.parse(req.query) : req.query,
      body: definition.body ? definition.body.parse(req.body ?? {}) : undefined,
      user: res.locals['user'] as User | undefined,
      req,
      res,
    };
    const { answerIdentity } = definition;
    if (!answerIdentity) {
      await definition.handler(input);
      return;
    }
    await answerByIdentity(req, res, {
      endpointPath: definition.path,
      identity: () => answerIdentity(input),
      build: () => definition.handler(input),
      kept: options.builtAnswers,
      sameForEveryRole: definition.answerSameForEveryRole,
    });
  };
  const prefix = options.mountedAt ?? '';
  if (!definition.path.startsWith(`${prefix}/`)) throw new Error(`Endpoint ${definition.path} lies outside ${prefix}`);
  // The answer cache sends what it kept itself, past the validator: the two do not combine.
  if (definition.revalidated && definition.cachedAnswer)
    throw new Error(`Endpoint ${definition.path}: revalidated and cachedAnswer cannot be combined`);
  if (definition.revalidated && definition.method !== 'get') throw new Error(`Endpoint ${definition.path}: only reads are revalidated`);
  if (definition.answerIdentity && !definition.revalidated)
    throw new Error(`Endpoint ${definition.path}: an answerIdentity makes the ETag of a revalidated read; mark it revalidated`);
  router[definition.method](
    definition.path.slice(prefix.length),
    requireRole(definition.access),
    ...(definition.heavy && options.heavyRequests ? [options.heavyRequests.middleware()] : []),
    ...(definition.cachedAnswer && definition.method === 'get' && options.answerCache ? [options.answerCache.serve()] : []),
    // With an identity, the handler itself answers 304 or the kept answer (answerByIdentity).
    ...(definition.revalidated && !definition.answerIdentity ? [revalidatedAnswer()] : []),
    ...(definition.middleware ?? []),
    handler,
  );
}

/** Roles allowed by an access rule (for documentation and the authorization matrix). */
export function rolesFor(access: Access, allRoles: readonly Role[]): readonly Role[] | 'public' {
  if (access === 'public') return 'public';
  if (access === 'signed-in') return allRoles;
  return access;
}

// Declares API routes once: the Express handler, zod validation of params/query/body, the access
// rule, and the OpenAPI entry all come from the same declaration. The registry also feeds the
// authorization matrix test, which fails when a route has no entry there.
import express, { Router, type Request, type RequestHandler, type Response } from 'express';
import { z, type ZodType } from 'zod';
import type { CampaignRole } from '@resonote/contracts';
import type { Db } from '@resonote/db/client';
import { requireAdmin, requireCampaignRole, requireKitKeeper, requireUser, type CampaignAccess, type SessionUser } from '../context.ts';
import { HttpError, zodDetails, zodMessage } from '../errors.ts';
import { refuseWhenArchived } from './archived.ts';

/** `kit-keeper`: an admin, or a lead of any campaign (the lab inventory). */
export type Access = 'public' | 'user' | 'admin' | 'kit-keeper' | CampaignRole;
export type Method = 'get' | 'post' | 'put' | 'patch' | 'delete';

export interface RouteContext<B, Q> {
  req: Request;
  res: Response;
  body: B;
  query: Q;
  params: Record<string, string>;
  /** Present unless the route is public. */
  user: SessionUser;
  /** Present on campaign routes. */
  campaign: CampaignAccess;
}

export interface RouteSpec<B = unknown, Q = unknown> {
  method: Method;
  /** Express path below /api, e.g. `/campaigns/:campaignId/points`. */
  path: string;
  summary: string;
  tag: string;
  access: Access;
  body?: ZodType<B>;
  query?: ZodType<Q>;
  /** Larger JSON bodies (geometry import). */
  bodyLimit?: string;
  /** Personal API tokens (`Authorization: Bearer rn_…`) may call this route; every other route refuses them. */
  tokenAccess?: boolean;
  /** A campaign route that is not a GET refuses an archived campaign (409 `campaign-archived`) unless this says 'allowed' (http/archived.ts). */
  whileArchived?: 'allowed';
  /** Extra middleware before validation (multer for uploads). */
  before?: RequestHandler[];
  /** Status of a successful answer (default 200). */
  status?: number;
  /** A note for the API reference: what the answer holds. */
  returns?: string;
  /**
   * The answer's JSON as a zod schema (from packages/contracts, which the web reads its types from);
   * the OpenAPI entry gets it as the response body. It documents, it does not filter the answer.
   */
  response?: ZodType;
  /** Content type of the answer when it is not JSON. */
  produces?: string;
  handler: (ctx: RouteContext<B, Q>) => Promise<unknown> | unknown;
}

export interface RegisteredRoute {
  method: Method;
  path: string;
  summary: string;
  tag: string;
  access: Access;
  tokenAccess: boolean;
  body?: ZodType;
  query?: ZodType;
  status: number;
  returns?: string;
  response?: ZodType;
  produces?: string;
}

/** Tokens reach only the routes the bridge needs; the rest of the API wants a signed-in session. */
const refuseApiToken: RequestHandler = (req, _res, next) => {
  next(req.apiToken ? new HttpError(403, 'token-not-allowed', 'API tokens cannot be used for this request; sign in on the web app for it.') : undefined);
};

export class ApiRoutes {
  readonly router = Router();
  readonly registry: RegisteredRoute[] = [];

  constructor(
    private readonly db: Db,
    private readonly jsonLimit: string,
  ) {}

  add<B = undefined, Q = Record<string, never>>(spec: RouteSpec<B, Q>): void {
    const guards: RequestHandler[] = [];
    if (!spec.tokenAccess) guards.push(refuseApiToken);
    if (spec.access === 'user') guards.push(requireUser);
    else if (spec.access === 'admin') guards.push(requireAdmin);
    else if (spec.access === 'kit-keeper') guards.push(requireKitKeeper(this.db));
    else if (spec.access !== 'public') {
      if (!spec.path.includes(':campaignId')) throw new Error(`route ${spec.path}: a campaign role needs :campaignId in the path`);
      guards.push(requireCampaignRole(this.db, spec.access));
      if (spec.method !== 'get' && spec.whileArchived !== 'allowed') guards.push(refuseWhenArchived(this.db));
    }
    const parsers: RequestHandler[] = [];
    if (spec.body && spec.method !== 'get') parsers.push(express.json({ limit: spec.bodyLimit ?? this.jsonLimit, strict: true }));

    const run: RequestHandler = async (req, res, next) => {
      try {
        let body: unknown = undefined;
        if (spec.body) {
          if (req.body === undefined && !req.is('multipart/form-data')) throw new HttpError(415, 'unsupported-media-type', 'Send the body as JSON (content-type: application/json).');
          const parsed = spec.body.safeParse(req.body ?? {});
          if (!parsed.success) throw new HttpError(400, 'invalid-input', zodMessage(parsed.error), zodDetails(parsed.error));
          body = parsed.data;
        }
        let query: unknown = {};
        if (spec.query) {
          const parsed = spec.query.safeParse(req.query);
          if (!parsed.success) throw new HttpError(400, 'invalid-query', zodMessage(parsed.error), zodDetails(parsed.error));
          query = parsed.data;
        }
        const result = await spec.handler({
          req,
          res,
          body: body as B,
          query: query as Q,
          params: req.params as Record<string, string>,
          user: req.user!,
          campaign: req.campaignAccess!,
        });
        if (res.headersSent) return;
        // A handler may choose another success status through res.locals.status (a replayed upload answers 200).
        const status = (res.locals.status as number | undefined) ?? spec.status;
        if (result === undefined) res.status(status ?? 204).end();
        else if (spec.method === 'get') res.status(status ?? 200).json(result);
        else {
          // Not res.json: Express would hash the body for an ETag, which only a GET can use (a hit's
          // answer is ≈ 0.4 MB of FRF, docs/decisions/hit-cost.md).
          const body = Buffer.from(JSON.stringify(result), 'utf8');
          res.status(status ?? 200).type('application/json').set('Content-Length', String(body.length)).end(body);
        }
      } catch (err) {
        next(err);
      }
    };
    this.router[spec.method](spec.path, ...guards, ...(spec.before ?? []), ...parsers, run);
    this.registry.push({
      method: spec.method,
      path: spec.path,
      summary: spec.summary,
      tag: spec.tag,
      access: spec.access,
      tokenAccess: spec.tokenAccess ?? false,
      body: spec.body as ZodType | undefined,
      query: spec.query as ZodType | undefined,
      status: spec.status ?? 200,
      returns: spec.returns,
      response: spec.response,
      produces: spec.produces,
    });
  }
}

/** Query schemas see strings; this coerces an optional positive integer with a default. */
export const intQuery = (def: number, max: number) => z.coerce.number().int().min(1).max(max).default(def);

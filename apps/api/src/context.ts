// Who is asking, and with which role. One middleware resolves the signed-in user for every /api
// route; route guards then ask for a signed-in user, an admin, or a campaign role.
import type { NextFunction, Request, RequestHandler, Response } from 'express';
import { and, eq } from 'drizzle-orm';
import { campaign, campaignMember, type CampaignRole } from '@resonote/db/schema';
import type { Db } from '@resonote/db/client';
import type { Auth } from './auth.ts';
import { forbidden, HttpError, notFound, unauthorized } from './errors.ts';

export interface SessionUser {
  id: string;
  email: string;
  name: string;
  role: 'admin' | 'member';
}

/** What a request may do in one campaign; admins act as leads everywhere. */
export interface CampaignAccess {
  campaignId: string;
  role: CampaignRole | 'admin';
}

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    interface Request {
      user?: SessionUser;
      campaignAccess?: CampaignAccess;
    }
  }
}

export function resolveUser(auth: Auth): RequestHandler {
  return async (req, _res, next) => {
    // A request that carried a personal API token was resolved by http/api-token.ts already.
    if (req.apiToken) return next();
    try {
      const headers = new Headers();
      if (req.headers.cookie) headers.set('cookie', req.headers.cookie);
      if (req.headers.authorization) headers.set('authorization', req.headers.authorization);
      const session = await auth.api.getSession({ headers });
      if (session?.user) {
        const u = session.user as typeof session.user & { role?: string };
        req.user = { id: u.id, email: u.email, name: u.name, role: u.role === 'admin' ? 'admin' : 'member' };
      }
      next();
    } catch (err) {
      next(err);
    }
  };
}

export const requireUser: RequestHandler = (req, _res, next) => {
  next(req.user ? undefined : unauthorized());
};

export const requireAdmin: RequestHandler = (req, _res, next) => {
  if (!req.user) return next(unauthorized());
  next(req.user.role === 'admin' ? undefined : forbidden('Only an admin of this instance can do this.'));
};

const rank: Record<CampaignRole | 'admin', number> = { viewer: 1, engineer: 2, lead: 3, admin: 4 };

const uuidPattern = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/**
 * Loads the caller's role in the campaign named by `:campaignId` and checks it is at least
 * `minimum`. A campaign the caller is not a member of answers 404, never 403, so its existence
 * does not leak.
 */
export function requireCampaignRole(db: Db, minimum: CampaignRole): RequestHandler {
  return async (req: Request, _res: Response, next: NextFunction) => {
    try {
      if (!req.user) return next(unauthorized());
      const campaignId = String(req.params.campaignId ?? '');
      if (!uuidPattern.test(campaignId)) return next(notFound('That campaign'));
      let role: CampaignAccess['role'] | undefined;
      if (req.apiToken) {
        // A token works in its own campaign only, with its role capped at the user's present role.
        if (req.apiToken.campaignId !== campaignId) return next(new HttpError(403, 'token-wrong-campaign', `This API token ("${req.apiToken.name}") was made for another campaign; create one for this campaign on your Account page.`));
        role = req.apiToken.role;
      } else if (req.user.role === 'admin') {
        const [row] = await db.select({ id: campaign.id }).from(campaign).where(eq(campaign.id, campaignId));
        role = row ? 'admin' : undefined;
      } else {
        const [row] = await db
          .select({ role: campaignMember.role })
          .from(campaignMember)
          .where(and(eq(campaignMember.campaignId, campaignId), eq(campaignMember.userId, req.user.id)));
        role = row?.role;
      }
      if (!role) return next(notFound('That campaign'));
      if (rank[role] < rank[minimum] && req.apiToken) return next(forbidden(`This needs the ${minimum} role in the campaign; this API token acts as a ${role} (the lower of the token's role and your role there now).`));
      if (rank[role] < rank[minimum]) return next(forbidden(`This needs the ${minimum} role in the campaign; you are ${role === 'admin' ? 'admin' : `a ${role}`}.`));
      req.campaignAccess = { campaignId, role };
      next();
    } catch (err) {
      next(err);
    }
  };
}

/**
 * The lab inventory is kept by the instance's admins and by anyone who leads a campaign (the
 * people design.md has registering kit); everyone else reads it.
 */
export function requireKitKeeper(db: Db): RequestHandler {
  return async (req: Request, _res: Response, next: NextFunction) => {
    try {
      if (!req.user) return next(unauthorized());
      if (req.user.role === 'admin') return next();
      const [row] = await db
        .select({ id: campaignMember.campaignId })
        .from(campaignMember)
        .where(and(eq(campaignMember.userId, req.user.id), eq(campaignMember.role, 'lead')))
        .limit(1);
      next(row ? undefined : forbidden('The lab inventory is kept by admins and campaign leads; ask one of them to change it.'));
    } catch (err) {
      next(err);
    }
  };
}

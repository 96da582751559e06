// Builds the Express app around a database, the mailer and better-auth. Used by the server and,
// unchanged, by the API and browser tests.
import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import express, { type Express } from 'express';
import helmet from 'helmet';
import { openDb, type DbHandle } from '@resonote/db/client';
import type { Config } from './config.ts';
import { createAuth, type Auth } from './auth.ts';
import { authHandler } from './auth-handler.ts';
import { resolveUser } from './context.ts';
import { resolveApiToken, TokenFailureLimiter } from './http/api-token.ts';
import { errorHandler, unknownApiRoute } from './errors.ts';
import { DatabaseStatus } from './db-health.ts';
import { postgresRateLimitStore } from './rate-limit-store.ts';
import { noStore, sameOriginWrites } from './http/same-origin.ts';
import { createMailer, type Mailer } from './mail.ts';
import { ApiRoutes, type RegisteredRoute } from './http/route.ts';
import { registerCampaignRoutes } from './routes/campaigns.ts';
import { registerMemberRoutes } from './routes/members.ts';
import { registerInvitationRoutes } from './routes/invitations.ts';
import { registerTeamRoutes } from './routes/team.ts';
import { registerReciprocalRoutes } from './routes/reciprocal.ts';
import { registerGeometryRoutes } from './routes/geometry.ts';
import { registerHitRoutes } from './routes/hits.ts';
import { registerResultRoutes } from './routes/results.ts';
import { CampaignEvents } from './hits/events.ts';
import { registerModeRoutes } from './routes/modes.ts';
import { registerModeTableRoutes } from './routes/mode-table.ts';
import { registerNoiseRoutes } from './routes/noise.ts';
import { FitQueue } from './modes/jobs.ts';
import { Jobs } from './jobs/queue.ts';
import { registerJobHandlers } from './jobs/handlers.ts';
import { registerJobRoutes } from './routes/jobs.ts';
import { flushResultWrites } from './hits/result-cache.ts';
import { registerKitRoutes } from './routes/kit.ts';
import { registerChannelRoutes } from './routes/channels.ts';
import { registerScheduleRoutes } from './routes/schedule.ts';
import { registerSettingsRoutes } from './routes/settings.ts';
import { registerSystemRoutes } from './routes/system.ts';
import { registerHandoverRoutes } from './routes/handover.ts';
import { registerTokenRoutes } from './routes/tokens.ts';
import { registerArmingRoutes } from './routes/arming.ts';
import { registerLiveInputRoutes } from './routes/live-input.ts';
import { registerFeModelRoutes } from './routes/fe-models.ts';
import { registerFeMapRoutes } from './routes/fe-map.ts';
import { registerFePlanRoutes } from './routes/fe-plan.ts';
import { registerKitPolicyRoutes } from './routes/kit-policy.ts';
import { registerLabRoutes } from './routes/lab.ts';
import { registerLabBookingRoutes } from './routes/lab-bookings.ts';
import { registerNoteRoutes } from './routes/notes.ts';
import { registerDofNoteEditRoutes } from './routes/dof-notes-edit.ts';
import { registerRedoRoutes } from './routes/redo.ts';

export interface AppHandle {
  app: Express;
  auth: Auth;
  mailer: Mailer;
  database: DbHandle;
  /** Whether the database is reachable now, and since when it is not. */
  databaseStatus: DatabaseStatus;
  config: Config;
  /** Background modal fits. */
  fits: FitQueue;
  /** The job queue (pg-boss); works jobs in this process when config.jobs.inProcess. */
  jobs: Jobs;
  /** Campaign change notices across processes. */
  events: CampaignEvents;
  /** Every API route with its access rule (OpenAPI and the authorization matrix test use it). */
  routes: RegisteredRoute[];
  close(): Promise<void>;
}

export interface AppOptions {
  config: Config;
  log?: (message: string) => void;
}

const defaultWebDist = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../../web/dist');

export async function createApp({ config, log = (m) => console.log(m) }: AppOptions): Promise<AppHandle> {
  const databaseStatus = new DatabaseStatus(log);
  // A connection lost under the pool is noted, never thrown: the next checkout opens a new one.
  const database = openDb(config.databaseUrl, { onConnectionError: (err) => databaseStatus.noteFailure(err), onConnect: () => databaseStatus.noteSuccess() });
  const mailer = await createMailer({ db: database.db, smtpUrl: config.smtpUrl, capturePort: config.smtpCapturePort, from: config.mailFrom });
  const auth = createAuth(database.db, config, mailer, databaseStatus);

  const app = express();
  app.disable('x-powered-by');
  // Whose X-Forwarded-For names the client (TRUST_PROXY; nobody's by default): req.ip follows it.
  app.set('trust proxy', config.trustProxy);
  app.use(
    helmet({
      contentSecurityPolicy: {
        directives: {
          // plotly injects style elements at run time.
          'style-src': ["'self'", "'unsafe-inline'"],
          'img-src': ["'self'", 'data:', 'blob:'],
          'worker-src': ["'self'", 'blob:'],
          'upgrade-insecure-requests': null,
        },
      },
      hsts: config.publicUrl.startsWith('https://'),
    }),
  );

  if (config.logRequests) {
    app.use((req, res, next) => {
      const started = process.hrtime.bigint();
      res.on('finish', () => {
        const ms = Number(process.hrtime.bigint() - started) / 1e6;
        log(`${req.method} ${req.originalUrl.split('?')[0]} ${res.statusCode} ${ms.toFixed(1)} ms ${req.ip ?? '-'}`);
      });
      next();
    });
  }

  // Every /api answer is per caller: never cached. Every cookie-carrying write must come from this
  // Resonote's own pages (Origin check), before the auth handler and any body parser or upload.
  app.use('/api', noStore);
  app.use('/api', sameOriginWrites({ allowedOrigins: config.allowedOrigins }));

  // better-auth reads the raw body itself, so it is mounted before express.json().
  app.all('/api/auth/*splat', authHandler(auth, config.authRateLimit, databaseStatus, postgresRateLimitStore(database.db)));

  const routes = new ApiRoutes(database.db, config.jsonBodyLimit);
  const events = new CampaignEvents(database.pool, config.databaseUrl);
  await events.start();
  const jobs = new Jobs(database.db, config);
  registerJobHandlers(jobs, database.db, config, events);
  await jobs.start({ work: config.jobs.inProcess });
  const deps = { routes, db: database.db, config, mailer, databaseStatus, events, jobs };
  registerSystemRoutes(deps);
  registerCampaignRoutes(deps);
  registerMemberRoutes(deps);
  registerInvitationRoutes(deps);
  registerTeamRoutes(deps);
  registerGeometryRoutes(deps);
  registerScheduleRoutes(deps);
  registerReciprocalRoutes(deps);
  registerKitRoutes(deps);
  registerChannelRoutes(deps);
  registerSettingsRoutes(deps);
  registerHitRoutes(deps, events);
  registerResultRoutes(deps, events);
  registerTokenRoutes(deps);
  registerArmingRoutes(deps, events);
  registerLiveInputRoutes(deps);
  registerNoiseRoutes(deps);
  const fits = new FitQueue(database.db, jobs);
  registerModeRoutes(deps, fits);
  registerModeTableRoutes(deps);
  registerHandoverRoutes(deps);
  registerJobRoutes(deps);
  registerFeModelRoutes(deps);
  registerFeMapRoutes(deps);
  registerFePlanRoutes(deps);
  registerKitPolicyRoutes(deps);
  registerLabRoutes(deps);
  registerLabBookingRoutes(deps);
  registerNoteRoutes(deps);
  registerDofNoteEditRoutes(deps);
  registerRedoRoutes(deps);

  app.use('/api', resolveApiToken(database.db, new TokenFailureLimiter()), resolveUser(auth));
  app.use('/api', routes.router);
  app.use('/api', unknownApiRoute);

  const webDist = config.webDist ?? defaultWebDist;
  if (fs.existsSync(path.join(webDist, 'index.html'))) {
    app.use(express.static(webDist, { index: false, maxAge: '1h', setHeaders: (res, file) => file.endsWith('.html') && res.setHeader('cache-control', 'no-cache') }));
    app.get('/{*any}', (_req, res) => {
      res.setHeader('cache-control', 'no-cache');
      res.sendFile(path.join(webDist, 'index.html'));
    });
  } else {
    app.get('/{*any}', (_req, res) => {
      res.status(503).type('text/plain').send('The web app is not built yet: run `npm start` (it builds apps/web), or `pnpm --filter @resonote/web dev`.');
    });
  }

  // Unexpected errors always reach the console (and fail a test through its console.error guard).
  app.use(errorHandler((message) => console.error(message), databaseStatus));

  return {
    app,
    auth,
    mailer,
    database,
    databaseStatus,
    config,
    fits,
    jobs,
    events,
    routes: routes.registry,
    async close() {
      await jobs.stop();
      await fits.close();
      await events.close();
      await flushResultWrites(database.db);
      await mailer.close();
      await database.close();
    },
  };
}

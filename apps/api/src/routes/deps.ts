import type { Db } from '@resonote/db/client';
import type { Config } from '../config.ts';
import type { Mailer } from '../mail.ts';
import type { ApiRoutes } from '../http/route.ts';
import type { DatabaseStatus } from '../db-health.ts';
import type { CampaignEvents } from '../hits/events.ts';
import type { Jobs } from '../jobs/queue.ts';

/** What every route module gets. */
export interface Deps {
  routes: ApiRoutes;
  db: Db;
  config: Config;
  mailer: Mailer;
  databaseStatus: DatabaseStatus;
  /** Campaign change notices, across processes (LISTEN/NOTIFY). */
  events: CampaignEvents;
  /** Background jobs (pg-boss). */
  jobs: Jobs;
}

// Which code works which queue — the same in a worker process and in the API run as one process.
import type { Db } from '@resonote/db/client';
import type { Config } from '../config.ts';
import type { CampaignEvents } from '../hits/events.ts';
import { fitJobHandler } from '../modes/jobs.ts';
import { backupHandler, reportPdfHandler, reprocessHandler } from './campaign-jobs.ts';
import type { Jobs } from './queue.ts';

export function registerJobHandlers(jobs: Jobs, db: Db, config: Config, events: CampaignEvents): void {
  jobs.handle('modal-fit', fitJobHandler(db));
  jobs.handle('reprocess', reprocessHandler(db, events));
  jobs.handle('report-pdf', reportPdfHandler(db, config, events));
  jobs.handle('backup', backupHandler(db, config, events));
}

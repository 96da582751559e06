// The whole Drizzle schema. Importing this opens no connection (see ../client.ts for that).
export * from './auth.ts';
export * from './campaign.ts';
export * from './mail.ts';
export * from './plan.ts';
export * from './kit.ts';
export * from './audit.ts';
export * from './hits.ts';
export * from './modes.ts';
export * from './bridge.ts';
export * from './jobs.ts';
export * from './fe-model.ts';
export * from './lab.ts';
export * from './campaign-archive.ts';
export * from './schedule-extra.ts';
export * from './live.ts';
export * from './redo.ts';
export * from './dof-notes.ts';

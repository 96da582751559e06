// The whole Drizzle schema. Importing this opens no connection (see ../client.ts for that).
export * from './auth.ts';
export * from './campaign.ts';
export * from './mail.ts';

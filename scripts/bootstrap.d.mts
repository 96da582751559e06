// Types of what the tests use from bootstrap.mjs (plain Node, so it runs before any install).
export interface PostgresCluster {
  name: string;
  port: number;
  data: string;
  logFile: string;
  url(database: string): string;
  postmasterPid(): number | null;
  running(): boolean;
  start(): { ok: boolean; message: string };
  startAsync(): Promise<{ ok: boolean; message: string }>;
  stop(mode?: 'smart' | 'fast' | 'immediate'): { ok: boolean; stdout: string; stderr: string };
  remove(): void;
}
export function postgresCluster(options: { name: string; port: number }): PostgresCluster;
export function ensureDatabase(port: number, database: string): void;
export function ensurePostgres(options: { name: string; port: number; database: string }): { url: string; stop: () => unknown; cluster: PostgresCluster };
export function log(message: string): void;
export const root: string;

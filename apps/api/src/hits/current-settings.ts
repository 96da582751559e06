// The campaign's current acquisition settings (the newest version), and what follows from them
// directly. Settings → dsp options are in hits/settings-to-dsp.ts.
import { desc, eq } from 'drizzle-orm';
import { acquisitionSettingsSchema, defaultAcquisitionSettings, type AcquisitionSettings } from '@resonote/contracts';
import { acquisitionSettings } from '@resonote/db/schema';
import type { Db } from '@resonote/db/client';

export interface CurrentSettings {
  version: number;
  settings: AcquisitionSettings;
}

/** The newest settings version of a campaign; version 0 with the defaults before any was saved. */
export async function currentSettings(db: Db, campaignId: string): Promise<CurrentSettings> {
  const [row] = await db
    .select({ version: acquisitionSettings.version, settings: acquisitionSettings.settings })
    .from(acquisitionSettings)
    .where(eq(acquisitionSettings.campaignId, campaignId))
    .orderBy(desc(acquisitionSettings.version))
    .limit(1);
  if (!row) return { version: 0, settings: defaultAcquisitionSettings };
  // Parsing fills fields added to the schema after the version was saved with their defaults.
  return { version: row.version, settings: acquisitionSettingsSchema.parse(row.settings) };
}

/** Samples per channel of one record: record length × sample rate. */
export function recordSamples(s: AcquisitionSettings): number {
  return Math.round(s.recordLengthS * s.sampleRateHz);
}

/** Samples before the trigger in one record: pre-trigger × sample rate. */
export function preTriggerSamples(s: AcquisitionSettings, fs = s.sampleRateHz): number {
  return Math.round(s.preTriggerS * fs);
}

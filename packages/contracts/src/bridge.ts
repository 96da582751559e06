// Personal API tokens, armed DOFs and the file-name pattern of the watched-folder bridge
// (issue 16). Shared by the API (validation), the web app (forms) and apps/bridge.
import { z } from 'zod';
import { campaignRoles } from './campaign.ts';

/** Every personal API token starts with this, so a leaked one is easy to recognise and search for. */
export const API_TOKEN_PREFIX = 'rn_';

export const apiTokenCreateSchema = z.strictObject({
  name: z.string().trim().min(1, 'give the token a name (e.g. "bridge on the test PC")').max(100),
  campaignId: z.uuid('campaignId must be a campaign id'),
  /** At most the role the user holds in the campaign now; the default is that role. */
  role: z.enum(campaignRoles).optional(),
  /** Days until the token stops working (1–366); omitted: no expiry. */
  expiresInDays: z.number().int().min(1).max(366).optional(),
});
export type ApiTokenCreate = z.infer<typeof apiTokenCreateSchema>;

export const armSchema = z.strictObject({ entryId: z.uuid('entryId must be a schedule entry id') });

/** "P07:+Z" and "P07+Z" name the same DOF: file names cannot hold a colon on every system. */
export function dofKey(label: string): string {
  return label.replace(/:/g, '').toUpperCase();
}

/** Why a file-name pattern cannot be used, or null when it can. */
export function fileNamePatternProblem(pattern: string): string | null {
  const count = (token: string) => pattern.split(token).length - 1;
  const r = count('{response}');
  const e = count('{excitation}');
  if (r + e === 0) return 'the pattern names neither {response} nor {excitation}';
  if (r > 1 || e > 1) return 'each of {response} and {excitation} may appear once';
  if (/[{}]/.test(pattern.replace('{response}', '').replace('{excitation}', ''))) return 'only {response} and {excitation} may stand in braces';
  return null;
}

/**
 * Reads the DOF labels out of a file name with a pattern like `{response}_{excitation}_*.wav`:
 * `*` is any run of characters, `?` one character, `{response}` / `{excitation}` a DOF label
 * (letters, digits, `+ - . :`). Case-insensitive, whole name. Null when the name does not fit.
 */
export function matchFileName(pattern: string, fileName: string): { response?: string; excitation?: string } | null {
  if (fileNamePatternProblem(pattern)) return null;
  let source = '';
  for (const part of pattern.split(/(\{response\}|\{excitation\}|\*|\?)/)) {
    if (part === '{response}') source += '(?<response>[A-Za-z0-9.:+-]+?)';
    else if (part === '{excitation}') source += '(?<excitation>[A-Za-z0-9.:+-]+?)';
    else if (part === '*') source += '.*';
    else if (part === '?') source += '.';
    else source += part.replace(/[.+^$()|[\]\\-]/g, '\\$&');
  }
  const m = new RegExp(`^${source}$`, 'i').exec(fileName);
  if (!m) return null;
  return { ...(m.groups?.response ? { response: m.groups.response } : {}), ...(m.groups?.excitation ? { excitation: m.groups.excitation } : {}) };
}

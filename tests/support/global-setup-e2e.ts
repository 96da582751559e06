import { createTemplate } from './db.ts';

export default async function setup() {
  await createTemplate('resonote_tpl_e2e');
}

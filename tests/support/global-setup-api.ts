import { createTemplate } from './db.ts';

export const API_TEMPLATE = 'resonote_tpl_api';

export default async function setup() {
  await createTemplate(API_TEMPLATE);
}

// A campaign worth looking at: a 4 × 3 plate of points with lines, a generated schedule in mixed
// states with assignees, a hammer and a triaxial accelerometer (one calibration overdue), a
// channel map and one saved settings version. Made through the real API as the crew's lead.
import { chromium, type Browser } from 'playwright-core';
import { defaultAcquisitionSettings } from '@resonote/contracts';
import type { CampaignCrew } from '../support/campaign.ts';

/** Debian's chromium with software WebGL, so the plotly 3D view draws in headless runs. */
export function launchBrowserWithWebgl(): Promise<Browser> {
  return chromium.launch({
    executablePath: process.env.RESONOTE_CHROMIUM ?? '/usr/bin/chromium',
    headless: true,
    args: ['--no-sandbox', '--use-angle=swiftshader', '--enable-unsafe-swiftshader', '--ignore-gpu-blocklist', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
  });
}

function ok(res: { status: number; body: unknown }, what: string, status = 200) {
  if (res.status !== status) throw new Error(`${what}: ${res.status} ${JSON.stringify(res.body)}`);
  return res.body as Record<string, unknown>;
}

export async function seedCampaign(crew: CampaignCrew) {
  const lead = crew.lead.agent;
  const id = crew.campaignId;
  const base = `/api/campaigns/${id}`;
  const rows = ['label,x,y,z,directions'];
  for (let j = 0; j < 3; j++) for (let i = 0; i < 4; i++) rows.push(`B${String(j * 4 + i + 1).padStart(2, '0')},${i * 200},${j * 150},0,+Z`);
  ok(await lead.post(`${base}/geometry/import`).send({ csv: rows.join('\n'), mode: 'merge' }), 'import');
  const geo = ok(await lead.get(`${base}/points`), 'points') as { points: { id: string; label: string }[] };
  const byLabel = new Map(geo.points.map((p) => [p.label, p.id]));
  const at = (i: number, j: number) => byLabel.get(`B${String(j * 4 + i + 1).padStart(2, '0')}`)!;
  for (let j = 0; j < 3; j++) for (let i = 0; i < 3; i++) ok(await lead.post(`${base}/lines`).send({ pointA: at(i, j), pointB: at(i + 1, j) }), 'line', 201);
  for (let j = 0; j < 2; j++) for (let i = 0; i < 4; i++) ok(await lead.post(`${base}/lines`).send({ pointA: at(i, j), pointB: at(i, j + 1) }), 'line', 201);

  const c = ok(await lead.get(base), 'campaign') as { campaign: { version: number } };
  ok(await lead.patch(base).send({ version: c.campaign.version, client: 'Northwind Pumps (fictional)', referenceDofs: ['B06:+Z'], status: 'testing', simulator: 'pump-skid' }), 'patch');
  const gen = ok(await lead.post(`${base}/schedule/generate`).send({}), 'generate') as { entries: { id: string; version: number }[] };
  const states = ['done', 'done', 'done', 'in-progress', 'flagged', 'skipped'];
  for (const [n, e] of gen.entries.entries()) {
    const body: Record<string, unknown> = { version: e.version };
    if (states[n]) body.status = states[n];
    body.assigneeId = n < 8 ? crew.engineer.id : null;
    ok(await lead.patch(`${base}/schedule/${e.id}`).send(body), 'entry');
  }

  const hammer = ok(await lead.post(`${base}/kit`).send({ kind: 'hammer', model: 'IH-05 impact hammer', serial: 'H2231', sensitivity: 10, sensitivityUnit: 'mV/lbf', tips: ['steel', 'plastic', 'rubber'], massG: 160 }), 'hammer', 201) as { item: { id: string } };
  const accel = ok(await lead.post(`${base}/kit`).send({ kind: 'accelerometer', model: 'TA-100 triaxial', serial: 'A7781', sensitivity: 100, sensitivityUnit: 'mV/g', axes: ['X', 'Y', 'Z'], massG: 4.2 }), 'accel', 201) as { item: { id: string } };
  ok(await lead.post(`${base}/kit`).send({ kind: 'accelerometer', model: 'UA-10 uniaxial', serial: 'U0042', sensitivity: 10.2, sensitivityUnit: 'mV/(m/s²)', axes: ['Z'] }), 'accel 2', 201);
  const day = (offset: number) => new Date(Date.now() + offset * 86_400_000).toISOString().slice(0, 10);
  ok(await lead.post(`${base}/kit/${hammer.item.id}/calibrations`).send({ calibratedOn: day(-300), dueOn: day(65), certificateRef: 'CAL-2291', performedBy: 'Metrology lab (fictional)' }), 'cal', 201);
  ok(await lead.post(`${base}/kit/${accel.item.id}/calibrations`).send({ calibratedOn: day(-400), dueOn: day(-35), certificateRef: 'CAL-1870', performedBy: 'Metrology lab (fictional)', sensitivity: 101.3 }), 'cal', 201);
  ok(await lead.post(`${base}/channels`).send({ channel: 1, kitItemId: hammer.item.id, label: 'Force' }), 'ch1', 201);
  ok(await lead.post(`${base}/channels`).send({ channel: 2, kitItemId: accel.item.id, axis: 'Z', dof: 'B06:+Z', label: 'Reference Z' }), 'ch2', 201);
  ok(await lead.post(`${base}/channels`).send({ channel: 3, kitItemId: accel.item.id, axis: 'X', dof: 'B06:+X', sign: -1, label: 'Reference X' }), 'ch3', 201);
  ok(await lead.put(`${base}/settings`).send({ baseVersion: 0, settings: { ...defaultAcquisitionSettings, bandHz: { low: 0, high: 3000 }, hitsToAverage: 6 }, reason: 'Band to 3 kHz for the plate modes' }), 'settings');
}

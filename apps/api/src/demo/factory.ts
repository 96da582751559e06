// Builds a campaign through the public API — the same validated paths a lead's browser uses.
// The demo seed and the tests both use it (shared/conventions.md: "the demo seed reuses the
// same factories and the simulator that the tests use").
export interface ApiClient {
  request(method: 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE', path: string, body?: unknown): Promise<{ status: number; body: any }>;
}

export interface CampaignSpec {
  name: string;
  structure: string;
  client: string;
  purpose?: 'calibrated-frf' | 'quick-survey';
  testType: 'roving-hammer' | 'roving-response';
  referenceDofs: string[];
  simulator: 'steel-bar' | 'pump-skid' | 'generic';
  notes?: string;
  points: { label: string; xMm: number; yMm: number; zMm: number }[];
  directions: string[];
  lines: [string, string][];
  hammer: { model: string; serial: string; sensitivity: number; sensitivityUnit: 'mV/N' | 'mV/lbf'; tips: string[] };
  accelerometers: { model: string; serial: string; sensitivity: number; sensitivityUnit: 'mV/(m/s²)' | 'mV/g'; dof: string }[];
  calibration?: { calibratedOn: string; dueOn: string; certificateRef: string; performedBy: string };
  settings: Record<string, unknown>;
  /** Where the campaign stands once built (default: planning). */
  status?: 'planning' | 'testing' | 'analysis' | 'handed-over';
}

export interface BuiltCampaign {
  campaignId: string;
  entries: { id: string; responseDof: string; excitationDof: string; drivingPoint: boolean; version: number }[];
}

async function ok(client: ApiClient, method: Parameters<ApiClient['request']>[0], path: string, body: unknown, what: string) {
  const res = await client.request(method, path, body);
  if (res.status >= 300) throw new Error(`${what} failed: ${res.status} ${JSON.stringify(res.body)}`);
  return res.body;
}

export async function buildCampaign(client: ApiClient, spec: CampaignSpec): Promise<BuiltCampaign> {
  const made = await ok(client, 'POST', '/api/campaigns', { name: spec.name, structure: spec.structure, client: spec.client, purpose: spec.purpose ?? 'calibrated-frf', testType: spec.testType, referenceDofs: spec.referenceDofs, simulator: spec.simulator, notes: spec.notes ?? '' }, 'campaign');
  const id = made.campaign.id as string;
  const base = `/api/campaigns/${id}`;
  const csv = ['label,x,y,z,directions', ...spec.points.map((p) => `${p.label},${p.xMm},${p.yMm},${p.zMm},${spec.directions.join(' ')}`)].join('\n');
  await ok(client, 'POST', `${base}/geometry/import`, { csv }, 'geometry import');
  const geometry = await ok(client, 'GET', `${base}/points`, undefined, 'points');
  const byLabel = new Map<string, string>(geometry.points.map((p: { label: string; id: string }) => [p.label, p.id]));
  for (const [a, b] of spec.lines) await ok(client, 'POST', `${base}/lines`, { pointA: byLabel.get(a), pointB: byLabel.get(b) }, 'line');
  const hammer = await ok(client, 'POST', `${base}/kit`, { kind: 'hammer', ...spec.hammer }, 'hammer');
  if (spec.calibration) await ok(client, 'POST', `${base}/kit/${hammer.item.id}/calibrations`, spec.calibration, 'calibration');
  await ok(client, 'POST', `${base}/channels`, { channel: 1, kitItemId: hammer.item.id, label: 'hammer' }, 'hammer channel');
  for (const [i, a] of spec.accelerometers.entries()) {
    const item = await ok(client, 'POST', `${base}/kit`, { kind: 'accelerometer', model: a.model, serial: a.serial, sensitivity: a.sensitivity, sensitivityUnit: a.sensitivityUnit, axes: ['Z'] }, 'accelerometer');
    if (spec.calibration) await ok(client, 'POST', `${base}/kit/${item.item.id}/calibrations`, spec.calibration, 'calibration');
    await ok(client, 'POST', `${base}/channels`, { channel: 2 + i, kitItemId: item.item.id, axis: 'Z', dof: a.dof, sign: 1, label: `accel ${a.dof}` }, 'accelerometer channel');
  }
  await ok(client, 'PUT', `${base}/settings`, { baseVersion: 0, settings: spec.settings, reason: 'campaign set-up' }, 'settings');
  const schedule = await ok(client, 'POST', `${base}/schedule/generate`, {}, 'schedule');
  if (spec.status && spec.status !== 'planning') {
    const current = await ok(client, 'GET', base, undefined, 'campaign');
    await ok(client, 'PATCH', base, { version: current.campaign.version, status: spec.status }, 'campaign status');
  }
  return { campaignId: id, entries: schedule.entries };
}

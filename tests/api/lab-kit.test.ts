// The lab inventory (hammers with tips, accelerometers with per-axis sensitivities, conditioners),
// its calibration history, who may keep it, and bookings by campaigns with overlapping dates
// shown, against the real app and PostgreSQL (design.md "Lab kit"; docs/methods.md#units).
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestApp, type TestApp } from '../support/app.ts';
import { API_TEMPLATE } from '../support/global-setup-api.ts';
import { makeCrew, type CampaignCrew } from '../support/campaign.ts';

let app: TestApp;
let crew: CampaignCrew;

beforeAll(async () => {
  app = await startTestApp(API_TEMPLATE);
  crew = await makeCrew(app, 'lab');
});
afterAll(async () => {
  await app?.close();
});

const dayFromToday = (days: number) => new Date(Date.now() + days * 86_400_000).toISOString().slice(0, 10);
type LabItem = { id: string; kind: string; version: number; sensitivity: number | null; sensitivityBase: number | null; axisSensitivities: Record<string, number>; tips: string[]; calibrations: unknown[]; bookings: { campaignId: string | null; campaignName: string | null; fromOn: string; toOn: string; bookedByName: string | null; otherCampaign: string | null }[] };
async function labItem(id: string): Promise<LabItem> {
  const res = await crew.viewer.agent.get('/api/lab/items');
  expect(res.status).toBe(200);
  return res.body.items.find((i: { id: string }) => i.id === id);
}

describe('the lab inventory', () => {
  let hammerId: string;
  let triaxId: string;

  it('takes a hammer in mV/lbf with its tips and converts it exactly to mV/N', async () => {
    const res = await crew.lead.agent.post('/api/lab/items').send({ kind: 'hammer', model: 'IH-10', serial: 'LAB-H1', sensitivity: 10, sensitivityUnit: 'mV/lbf', tips: ['rubber', 'plastic', 'steel'] });
    expect(res.status).toBe(201);
    hammerId = res.body.item.id;
    // 1 lbf = 4.4482216152605 N exactly (NIST SP 811, 2008, B.8): 10 mV/lbf = 2.248089430997105 mV/N.
    expect(res.body.item).toMatchObject({ kind: 'hammer', sensitivity: 10, sensitivityUnit: 'mV/lbf', sensitivityBase: 10 / 4.4482216152605, sensitivityBaseUnit: 'mV/N', tips: ['rubber', 'plastic', 'steel'] });
    expect(res.body.item.sensitivityBase).toBeCloseTo(2.248089431, 9);
  });

  it('takes a triaxial accelerometer with one sensitivity per axis, converted from mV/g with g_n = 9.80665 m/s² exactly', async () => {
    const res = await crew.admin.agent.post('/api/lab/items').send({ kind: 'accelerometer', model: 'TRI-3', serial: 'LAB-T1', sensitivity: 100, sensitivityUnit: 'mV/g', axes: ['X', 'Y', 'Z'], axisSensitivities: { X: 98.2, Y: 101.5, Z: 100.3 } });
    expect(res.status).toBe(201);
    triaxId = res.body.item.id;
    // CGPM 1901 (3rd CGPM): g_n = 9.80665 m/s²; 98.2 mV/g = 10.01361 mV/(m/s²).
    expect(res.body.item.axisSensitivities).toEqual({ X: 98.2 / 9.80665, Y: 101.5 / 9.80665, Z: 100.3 / 9.80665 });
    expect(res.body.item.axisSensitivities.X).toBeCloseTo(10.01361, 5);
  });

  it('takes a conditioner without a sensitivity, and refuses bad input with 400 in the one error shape', async () => {
    const cond = await crew.lead.agent.post('/api/lab/items').send({ kind: 'conditioner', model: 'SC-4', serial: 'LAB-C1' });
    expect(cond.status).toBe(201);
    expect(cond.body.item).toMatchObject({ kind: 'conditioner', sensitivity: null, sensitivityBase: null });
    const wrongUnit = await crew.lead.agent.post('/api/lab/items').send({ kind: 'hammer', model: 'X', serial: 'Y', sensitivity: 2, sensitivityUnit: 'mV/g' });
    expect(wrongUnit.status).toBe(400);
    expect(wrongUnit.body.error).toMatchObject({ code: 'invalid-input' });
    const noAxis = await crew.lead.agent.post('/api/lab/items').send({ kind: 'accelerometer', model: 'UNI', serial: 'U1', sensitivity: 10, sensitivityUnit: 'mV/(m/s²)', axes: ['Z'], axisSensitivities: { X: 10 } });
    expect(noAxis.status).toBe(400);
    expect(noAxis.body.error.message).toBe('axisSensitivities: the sensor has no X axis (its axes: Z).');
    const negative = await crew.lead.agent.post('/api/lab/items').send({ kind: 'hammer', model: 'X', serial: 'Y', sensitivity: -2, sensitivityUnit: 'mV/N' });
    expect(negative.status).toBe(400);
    const dup = await crew.lead.agent.post('/api/lab/items').send({ kind: 'hammer', model: 'ih-10', serial: 'lab-h1', sensitivity: 10, sensitivityUnit: 'mV/lbf' });
    expect(dup.status).toBe(409);
    expect(dup.body.error.message).toBe('Hammer ih-10 (SN lab-h1) is already in the lab inventory.');
  });

  it('is kept by admins and campaign leads only: engineers and viewers get 403, everyone signed in reads it', async () => {
    const asEngineer = await crew.engineer.agent.post('/api/lab/items').send({ kind: 'conditioner', model: 'SC-9', serial: 'E1' });
    expect(asEngineer.status).toBe(403);
    expect(asEngineer.body.error.message).toBe('The lab inventory is kept by admins and campaign leads; ask one of them to change it.');
    const asViewer = await crew.viewer.agent.post(`/api/lab/items/${hammerId}/calibrations`).send({ calibratedOn: dayFromToday(-1), dueOn: dayFromToday(364), certificateRef: 'X', performedBy: 'Y' });
    expect(asViewer.status).toBe(403);
    const byOutsider = await crew.outsider.agent.patch(`/api/lab/items/${hammerId}`).send({ version: 1, notes: 'tip thread re-cut' });
    expect(byOutsider.status, 'a lead of another campaign keeps the inventory too').toBe(200);
    expect((await labItem(hammerId)).version).toBe(2);
  });

  it('keeps the calibration history and asks before a change beyond 5 % on any axis, with both values in both units', async () => {
    const first = await crew.lead.agent.post(`/api/lab/items/${triaxId}/calibrations`).send({ calibratedOn: dayFromToday(-5), dueOn: dayFromToday(360), certificateRef: 'T-1', performedBy: 'Cal lab', axisSensitivities: { X: 99 } });
    expect(first.status).toBe(201); // 98.2 → 99 mV/g is 0.81 %
    const big = await crew.lead.agent.post(`/api/lab/items/${triaxId}/calibrations`).send({ calibratedOn: dayFromToday(-1), dueOn: dayFromToday(364), certificateRef: 'T-2', performedBy: 'Cal lab', axisSensitivities: { Y: 10.15 } });
    expect(big.status).toBe(409);
    expect(big.body.error.code).toBe('large-sensitivity-change');
    // 101.5 → 10.15 mV/g is −90 %; both in mV/(m/s²) and mV/g.
    expect(big.body.error.details.changePct).toBeCloseTo(90, 9);
    expect(big.body.error.details.previous[1]).toEqual({ value: expect.closeTo(101.5, 9), unit: 'mV/g' });
    expect(big.body.error.details.next[0]).toEqual({ value: 10.15 / 9.80665, unit: 'mV/(m/s²)' });
    expect(big.body.error.message).toMatch(/^Accelerometer TRI-3 \(SN LAB-T1\), axis Y: the new sensitivity 1\.035 mV\/\(m\/s²\) = 10\.15 mV\/g differs from the previous 10\.35 mV\/\(m\/s²\) = 101\.5 mV\/g by 90\.0 %/);
    const item = await labItem(triaxId);
    expect(item.calibrations).toHaveLength(1);
    expect(item.axisSensitivities.X).toBe(99 / 9.80665);
    expect(item.axisSensitivities.Y).toBe(101.5 / 9.80665);
  });
});

describe('bookings', () => {
  let hammerId: string;
  beforeAll(async () => {
    const res = await crew.lead.agent.post('/api/lab/items').send({ kind: 'hammer', model: 'IH-20', serial: 'BK-1', sensitivity: 2.25, sensitivityUnit: 'mV/N', tips: ['soft', 'hard'] });
    hammerId = res.body.item.id;
    await crew.lead.agent.post(`/api/lab/items/${hammerId}/calibrations`).send({ calibratedOn: dayFromToday(-30), dueOn: dayFromToday(335), certificateRef: 'BK-CAL-1', performedBy: 'Cal lab' }).expect(201);
  });

  it('puts the booked hammer into the campaign’s Kit with its tips and calibration history', async () => {
    const res = await crew.lead.agent.post(`/api/campaigns/${crew.campaignId}/bookings`).send({ labItemId: hammerId, fromOn: dayFromToday(1), toOn: dayFromToday(10) });
    expect(res.status).toBe(201);
    expect(res.body.overlaps).toEqual([]);
    expect(res.body.kitItem).toMatchObject({ kind: 'hammer', model: 'IH-20', serial: 'BK-1', sensitivityBase: 2.25, tips: ['soft', 'hard'], labItemId: hammerId });
    const kit = await crew.viewer.agent.get(`/api/campaigns/${crew.campaignId}/kit`);
    const copy = kit.body.items.find((i: { id: string }) => i.id === res.body.kitItem.id);
    expect(copy.calibrations.map((c: { certificateRef: string }) => c.certificateRef)).toEqual(['BK-CAL-1']);
    expect(copy.calibration.state).toBe('ok');
  });

  it('answers who else has the item on overlapping dates, and not for dates after its booking ends', async () => {
    // The outsider leads the other campaign: days 8–12 overlap days 1–10 (8, 9, 10 in common).
    const other = await crew.outsider.agent.post(`/api/campaigns/${crew.otherCampaignId}/bookings`).send({ labItemId: hammerId, fromOn: dayFromToday(8), toOn: dayFromToday(12) });
    expect(other.status).toBe(201);
    // The outsider is not a member of the first campaign: the dates, not its name or who booked.
    expect(other.body.overlaps).toEqual([{ id: expect.any(String), campaignId: null, campaignName: null, fromOn: dayFromToday(1), toOn: dayFromToday(10), bookedByName: null, otherCampaign: 'booked by another campaign' }]);
    const later = await crew.outsider.agent.post(`/api/campaigns/${crew.otherCampaignId}/bookings`).send({ labItemId: hammerId, fromOn: dayFromToday(11), toOn: dayFromToday(20) });
    expect(later.body.overlaps, 'days 11–20 do not meet days 1–10').toEqual([]);
    const mine = await crew.viewer.agent.get(`/api/campaigns/${crew.campaignId}/bookings`);
    expect(mine.status).toBe(200);
    expect(mine.body.bookings).toHaveLength(1);
    // Days 1–10 meet days 8–12 and not days 11–20.
    expect(mine.body.bookings[0].overlaps.map((o: { fromOn: string; toOn: string }) => [o.fromOn, o.toOn])).toEqual([[dayFromToday(8), dayFromToday(12)]]);
    // The viewer is not in the outsider's campaign either: its booking shows as another campaign's.
    expect(mine.body.bookings[0].overlaps[0]).toMatchObject({ campaignName: null, bookedByName: null, otherCampaign: 'booked by another campaign' });
  });

  it('refuses bad dates and a booking by an engineer', async () => {
    const backwards = await crew.lead.agent.post(`/api/campaigns/${crew.campaignId}/bookings`).send({ labItemId: hammerId, fromOn: dayFromToday(5), toOn: dayFromToday(4) });
    expect(backwards.status).toBe(400);
    expect(backwards.body.error.details).toEqual([{ path: 'toOn', message: 'the booking ends on or after the day it starts' }]);
    const notADate = await crew.lead.agent.post(`/api/campaigns/${crew.campaignId}/bookings`).send({ labItemId: hammerId, fromOn: '2026-02-30', toOn: dayFromToday(4) });
    expect(notADate.status).toBe(400);
    const unknown = await crew.lead.agent.post(`/api/campaigns/${crew.campaignId}/bookings`).send({ labItemId: '00000000-0000-4000-8000-000000000000', fromOn: dayFromToday(1), toOn: dayFromToday(2) });
    expect(unknown.status).toBe(404);
    const asEngineer = await crew.engineer.agent.post(`/api/campaigns/${crew.campaignId}/bookings`).send({ labItemId: hammerId, fromOn: dayFromToday(1), toOn: dayFromToday(2) });
    expect(asEngineer.status).toBe(403);
  });

  it('passes a later lab calibration with a new sensitivity on to the campaigns that book the item', async () => {
    const res = await crew.lead.agent.post(`/api/lab/items/${hammerId}/calibrations`).send({ calibratedOn: dayFromToday(0), dueOn: dayFromToday(365), certificateRef: 'BK-CAL-2', performedBy: 'Cal lab', sensitivity: 2.3 });
    expect(res.status).toBe(201); // 2.25 → 2.3 mV/N is 2.2 %
    expect(res.body.campaignsUpdated).toBe(2);
    const kit = await crew.viewer.agent.get(`/api/campaigns/${crew.campaignId}/kit`);
    const copy = kit.body.items.find((i: { labItemId: string }) => i.labItemId === hammerId);
    expect(copy).toMatchObject({ sensitivity: 2.3, sensitivityBase: 2.3 });
    expect(copy.calibrations.map((c: { certificateRef: string }) => c.certificateRef)).toEqual(['BK-CAL-2', 'BK-CAL-1']);
    const lab = await labItem(hammerId);
    expect(lab.bookings).toHaveLength(3);
  });

  it('names the campaign that booked an item only to its members; anyone else reads "booked by another campaign" with the dates', async () => {
    const other = { campaignId: null, campaignName: null, bookedByName: null, otherCampaign: 'booked by another campaign' };
    // The viewer is a member of the bracket campaign only (support/campaign.ts makeCrew).
    const seenByViewer = await labItem(hammerId);
    expect(seenByViewer.bookings).toEqual([
      expect.objectContaining({ campaignId: crew.campaignId, campaignName: 'Bracket modal survey lab', bookedByName: 'Lena Lead lab', fromOn: dayFromToday(1), toOn: dayFromToday(10), otherCampaign: null }),
      expect.objectContaining({ ...other, fromOn: dayFromToday(8), toOn: dayFromToday(12) }),
      expect.objectContaining({ ...other, fromOn: dayFromToday(11), toOn: dayFromToday(20) }),
    ]);
    expect(JSON.stringify(seenByViewer.bookings)).not.toContain('Other campaign lab');
    expect(JSON.stringify(seenByViewer.bookings)).not.toContain(crew.otherCampaignId);
    // The outsider leads the other campaign and is no member of the bracket campaign: the reverse.
    const res = await crew.outsider.agent.get('/api/lab/items');
    expect(res.status).toBe(200);
    const seenByOutsider = (res.body.items as LabItem[]).find((i) => i.id === hammerId)!;
    expect(seenByOutsider.bookings).toEqual([
      expect.objectContaining({ ...other, fromOn: dayFromToday(1), toOn: dayFromToday(10) }),
      expect.objectContaining({ campaignId: crew.otherCampaignId, campaignName: 'Other campaign lab', fromOn: dayFromToday(8), toOn: dayFromToday(12), otherCampaign: null }),
      expect.objectContaining({ campaignId: crew.otherCampaignId, campaignName: 'Other campaign lab', fromOn: dayFromToday(11), toOn: dayFromToday(20), otherCampaign: null }),
    ]);
    expect(JSON.stringify(seenByOutsider.bookings)).not.toContain('Bracket modal survey lab');
  });
});

// Data of the lab inventory, bookings, the calibration policy and readiness, and notes per DOF.
import { useQuery } from '@tanstack/react-query';
import type { CalibrationPolicy, NoteTopic } from '@resonote/contracts';
import { api, ApiError, retryAfterSeconds } from './api.ts';
import type { CalibrationRecord, CalibrationStateName } from './campaign-data.ts';

export interface LabItem {
  id: string;
  kind: 'hammer' | 'accelerometer' | 'conditioner';
  model: string;
  serial: string;
  sensitivity: number | null;
  sensitivityUnit: string | null;
  sensitivityBase: number | null;
  sensitivityBaseUnit: string | null;
  axisSensitivities: Partial<Record<'X' | 'Y' | 'Z', number>>;
  tips: string[];
  axes: ('X' | 'Y' | 'Z')[];
  notes: string;
  retired: boolean;
  version: number;
  calibrations: (CalibrationRecord & { axisSensitivities: Partial<Record<'X' | 'Y' | 'Z', number>> })[];
  calibration: { state: CalibrationStateName; days: number | null; dueOn: string | null };
  /** A booking of a campaign the reader is not a member of has no campaign and carries `otherCampaign` (words) instead. */
  bookings: { id: string; campaignId: string | null; campaignName: string | null; fromOn: string; toOn: string; bookedByName: string | null; otherCampaign: string | null }[];
}

export interface Overlap {
  id: string;
  /** Null, with `otherCampaign` in words, when the reader is not a member of the booking's campaign. */
  campaignId: string | null;
  campaignName: string | null;
  fromOn: string;
  toOn: string;
  bookedByName: string | null;
  otherCampaign: string | null;
}
export interface Booking {
  id: string;
  labItemId: string;
  kind: LabItem['kind'];
  model: string;
  serial: string;
  fromOn: string;
  toOn: string;
  kitItemId: string | null;
  bookedByName: string | null;
  overlaps: Overlap[];
}

export interface KitPolicy {
  calibration: CalibrationPolicy;
  changeTolerancePct: number;
  version: number;
}
export interface Readiness {
  policy: KitPolicy;
  channels: { channel: number; kitItemId: string; kind: 'hammer' | 'accelerometer'; model: string; serial: string; axis: string | null; state: CalibrationStateName; days: number | null; dueOn: string | null; problem: string | null }[];
  problems: string[];
  blocking: boolean;
}

export interface DofNote {
  id: string;
  entryId: string | null;
  excitationDof: string;
  responseDof: string;
  topic: NoteTopic;
  text: string;
  authorId: string | null;
  authorName: string | null;
  createdAt: string;
  editedAt: string | null;
  version: number;
  photo: { mime: string; size: number; thumbnail: boolean } | null;
}

export const labKeys = {
  items: ['lab', 'items'] as const,
  bookings: (id: string) => ['campaign', id, 'bookings'] as const,
  policy: (id: string) => ['campaign', id, 'kit-policy'] as const,
  readiness: (id: string) => ['campaign', id, 'kit-readiness'] as const,
  notes: (id: string) => ['campaign', id, 'notes'] as const,
};

export const useLabItems = () => useQuery({ queryKey: labKeys.items, queryFn: () => api<{ items: LabItem[]; today: string; canEdit: boolean }>('/lab/items') });
export const useBookings = (id: string) => useQuery({ queryKey: labKeys.bookings(id), queryFn: () => api<{ bookings: Booking[] }>(`/campaigns/${id}/bookings`) });
export const useKitPolicy = (id: string) => useQuery({ queryKey: labKeys.policy(id), queryFn: () => api<{ policy: KitPolicy }>(`/campaigns/${id}/kit-policy`) });
export const useReadiness = (id: string) => useQuery({ queryKey: labKeys.readiness(id), queryFn: () => api<Readiness>(`/campaigns/${id}/kit-readiness`) });
/** Every note of the campaign (one query for Tap's badge, Review and the hand-over view). */
export const useNotes = (id: string) => useQuery({ queryKey: labKeys.notes(id), queryFn: () => api<{ notes: DofNote[] }>(`/campaigns/${id}/notes`) });

export const photoUrl = (campaignId: string, noteId: string) => `/api/campaigns/${campaignId}/notes/${noteId}/photo`;

export const thumbnailUrl = (campaignId: string, noteId: string) => `/api/campaigns/${campaignId}/notes/${noteId}/thumbnail`;

/**
 * Sends a note as multipart/form-data (the photo, when given, in the field "file", its thumbnail in
 * "thumbnail") with an Idempotency-Key: the caller keeps the key for a retry of the same note.
 */
export async function postNote(campaignId: string, entryId: string, note: { topic: NoteTopic; text: string; photo: File | null; thumbnail?: Blob | null }, key: string): Promise<{ note: DofNote; replayed: boolean }> {
  const form = new FormData();
  form.set('topic', note.topic);
  form.set('text', note.text);
  if (note.photo) form.set('file', note.photo);
  if (note.photo && note.thumbnail) form.set('thumbnail', note.thumbnail, 'thumbnail.jpg');
  let response: Response;
  try {
    response = await fetch(`/api/campaigns/${campaignId}/schedule/${entryId}/notes`, { method: 'POST', body: form, credentials: 'same-origin', headers: { 'Idempotency-Key': key } });
  } catch {
    throw new ApiError(0, 'offline', 'The server cannot be reached. Check the connection; the note was not saved.');
  }
  const data = (await response.json().catch(() => undefined)) as { note?: DofNote; error?: { code: string; message: string; details?: unknown } } | undefined;
  if (!response.ok) throw new ApiError(response.status, data?.error?.code ?? `http-${response.status}`, data?.error?.message ?? `The server answered ${response.status}.`, data?.error?.details, retryAfterSeconds(response.headers.get('retry-after')));
  return data as { note: DofNote; replayed: boolean };
}

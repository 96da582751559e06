// Types and queries of one campaign's plan and kit, shared by the campaign screens.
import { useQuery } from '@tanstack/react-query';
import type { AcquisitionSettings, CampaignRole, CampaignStatus, Direction, FlagReason, ScheduleStatus, TestType } from '@resonote/contracts';
import { api } from './api.ts';

export type MyRole = CampaignRole | 'admin';

export interface Campaign {
  id: string;
  name: string;
  structure: string;
  client: string;
  purpose: 'calibrated-frf' | 'quick-survey';
  status: CampaignStatus;
  testType: TestType;
  referenceDofs: string[];
  notes: string;
  simulator: 'steel-bar' | 'pump-skid' | 'generic';
  version: number;
  updatedAt: string;
  /** Set while the campaign is archived (read-only). */
  archivedAt: string | null;
  archiveReason: string | null;
}

export interface GeometryPoint {
  id: string;
  label: string;
  x: number;
  y: number;
  z: number;
  directions: Direction[];
  retired: boolean;
  hasHits: boolean;
  version: number;
}
export interface GeometryLine {
  id: string;
  pointA: string;
  pointB: string;
}

export interface ScheduleEntry {
  id: string;
  position: number;
  responsePointId: string;
  responseLabel: string;
  responseDirection: Direction;
  excitationPointId: string;
  excitationLabel: string;
  excitationDirection: Direction;
  responseDof: string;
  excitationDof: string;
  drivingPoint: boolean;
  status: ScheduleStatus;
  requiredHits: number;
  assigneeId: string | null;
  assigneeName: string | null;
  note: string;
  version: number;
  acceptedHits: number;
  rejectedHits: number;
  /** Why the entry is flagged (or, with all its hits, not done), in words with numbers. */
  flagReasons: FlagReason[];
}

export interface Member {
  userId: string;
  name: string;
  email: string;
  role: CampaignRole;
  version: number;
}
export interface Invitation {
  id: string;
  email: string;
  role: CampaignRole;
  createdAt: string;
  expiresAt: string;
}

export type CalibrationStateName = 'ok' | 'due-soon' | 'overdue' | 'none';
export interface CalibrationRecord {
  id: string;
  calibratedOn: string;
  dueOn: string;
  certificateRef: string;
  performedBy: string;
  sensitivity: number | null;
  sensitivityUnit: string | null;
  recordedByName: string | null;
}
export interface KitItem {
  id: string;
  kind: 'hammer' | 'accelerometer';
  model: string;
  serial: string;
  sensitivity: number;
  sensitivityUnit: string;
  sensitivityBase: number;
  sensitivityBaseUnit: string;
  tips: string[];
  axes: ('X' | 'Y' | 'Z')[];
  massG: number | null;
  notes: string;
  retired: boolean;
  version: number;
  calibrations: CalibrationRecord[];
  calibration: { state: CalibrationStateName; days: number | null; dueOn: string | null };
}
export interface KitAnswer {
  items: KitItem[];
  warnings: { kitItemId: string; state: CalibrationStateName; message: string }[];
  today: string;
}

export interface Channel {
  id: string;
  channel: number;
  kitItemId: string;
  axis: 'X' | 'Y' | 'Z' | null;
  dof: string | null;
  sign: 1 | -1;
  label: string;
  version: number;
  kind: 'hammer' | 'accelerometer';
  model: string;
  serial: string;
  sensitivityBase: number;
  sensitivityBaseUnit: string;
  retired: boolean;
}

export interface SettingsAnswer {
  current: { version: number; settings: AcquisitionSettings; reason: string; createdAt: string | null; createdBy: string | null };
  history: { version: number; createdAt: string; createdBy: string | null; reason: string; changes: { field: string; before: unknown; after: unknown }[] }[];
  defaults: AcquisitionSettings;
}

export const keys = {
  campaign: (id: string) => ['campaign', id] as const,
  points: (id: string) => ['campaign', id, 'points'] as const,
  schedule: (id: string) => ['campaign', id, 'schedule'] as const,
  members: (id: string) => ['campaign', id, 'members'] as const,
  invitations: (id: string) => ['campaign', id, 'invitations'] as const,
  kit: (id: string) => ['campaign', id, 'kit'] as const,
  channels: (id: string) => ['campaign', id, 'channels'] as const,
  settings: (id: string) => ['campaign', id, 'settings'] as const,
};

export const useCampaign = (id: string) => useQuery({ queryKey: keys.campaign(id), queryFn: () => api<{ campaign: Campaign; myRole: MyRole }>(`/campaigns/${id}`) });
export const useGeometry = (id: string) => useQuery({ queryKey: keys.points(id), queryFn: () => api<{ points: GeometryPoint[]; lines: GeometryLine[] }>(`/campaigns/${id}/points`) });
export const useSchedule = (id: string) => useQuery({ queryKey: keys.schedule(id), queryFn: () => api<{ entries: ScheduleEntry[] }>(`/campaigns/${id}/schedule`) });
export const useMembers = (id: string) => useQuery({ queryKey: keys.members(id), queryFn: () => api<{ members: Member[] }>(`/campaigns/${id}/members`) });
export const useInvitations = (id: string, enabled: boolean) =>
  useQuery({ queryKey: keys.invitations(id), queryFn: () => api<{ invitations: Invitation[] }>(`/campaigns/${id}/invitations`), enabled });
export const useKit = (id: string) => useQuery({ queryKey: keys.kit(id), queryFn: () => api<KitAnswer>(`/campaigns/${id}/kit`) });
export const useChannels = (id: string) => useQuery({ queryKey: keys.channels(id), queryFn: () => api<{ channels: Channel[] }>(`/campaigns/${id}/channels`) });
export const useSettings = (id: string) => useQuery({ queryKey: keys.settings(id), queryFn: () => api<SettingsAnswer>(`/campaigns/${id}/settings`) });

export const roleLabel: Record<MyRole, string> = { lead: 'Lead', engineer: 'Engineer', viewer: 'Viewer', admin: 'Admin' };
export const purposeLabel = { 'calibrated-frf': 'Calibrated FRF measurement', 'quick-survey': 'Quick survey' } as const;
export const testTypeLabel = { 'roving-hammer': 'Roving hammer', 'roving-response': 'Roving response' } as const;
export const simulatorLabel = { 'steel-bar': 'Free-free steel bar', 'pump-skid': 'Pump-skid baseplate', generic: 'Generic (beam model from the geometry)' } as const;

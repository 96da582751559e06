// Overview: the geometry coloured by schedule status, a point's entries on click, counts by
// status, who is assigned where, and calibration warnings.
import { useMemo, useState } from 'react';
import { Link, useParams } from 'react-router';
import { scheduleStatuses, type ScheduleStatus } from '@resonote/contracts';
import { useGeometry, useKit, useSchedule, type ScheduleEntry } from '../../lib/campaign-data.ts';
import { GeometryView } from '../../components/geometry-view.tsx';
import { scheduleLook, ScheduleStatusBadge, worstStatus } from '../../components/status.tsx';
import { Notice, Panel, Spinner } from '../../components/ui.tsx';
import { useCampaignContext } from './campaign-context.ts';
import { WarningList } from './kit/warning-list.tsx';
import { FlagReasons } from '../../components/flag-reasons.tsx';

/** The point an entry belongs to on the map: the one that moves (hammer or accelerometer). */
export function rovingPointId(entry: ScheduleEntry, testType: string) {
  return testType === 'roving-response' ? entry.responsePointId : entry.excitationPointId;
}

export function OverviewPage() {
  const { campaignId = '' } = useParams();
  const { campaign, canLead } = useCampaignContext();
  const geometry = useGeometry(campaignId);
  const schedule = useSchedule(campaignId);
  const kit = useKit(campaignId);
  const [selected, setSelected] = useState<string | null>(null);

  const entries = useMemo(() => schedule.data?.entries ?? [], [schedule.data]);
  const points = useMemo(() => (geometry.data?.points ?? []).filter((p) => !p.retired), [geometry.data]);
  const flagged = useMemo(() => entries.filter((e) => e.status === 'flagged'), [entries]);
  const statusByPointId = useMemo(() => {
    const lists: Record<string, ScheduleStatus[]> = {};
    for (const e of entries) (lists[rovingPointId(e, campaign.testType)] ??= []).push(e.status);
    return Object.fromEntries(Object.entries(lists).map(([id, list]) => [id, worstStatus(list)]));
  }, [entries, campaign.testType]);
  const counts = useMemo(() => {
    const c = Object.fromEntries(scheduleStatuses.map((s) => [s, 0])) as Record<ScheduleStatus, number>;
    for (const e of entries) c[e.status]++;
    return c;
  }, [entries]);
  const assignments = useMemo(() => {
    const map = new Map<string, { name: string; entries: ScheduleEntry[] }>();
    for (const e of entries) {
      const key = e.assigneeId ?? '';
      if (!map.has(key)) map.set(key, { name: e.assigneeName ?? 'Not assigned', entries: [] });
      map.get(key)!.entries.push(e);
    }
    return [...map.entries()].sort(([a], [b]) => (a === '' ? 1 : b === '' ? -1 : 0)).map(([, v]) => v);
  }, [entries]);

  const selectedPoint = points.find((p) => p.id === selected);
  const selectedEntries = selected ? entries.filter((e) => e.responsePointId === selected || e.excitationPointId === selected) : [];

  return (
    <div className="space-y-4">
      {kit.data && kit.data.warnings.length > 0 && <WarningList warnings={kit.data.warnings} />}
      <div className="grid gap-4 lg:grid-cols-[minmax(0,1fr)_340px]">
        <Panel title="Geometry and progress">
          {(geometry.isPending || schedule.isPending) && <Spinner label="Loading the geometry and the schedule…" />}
          {geometry.isError && <Notice tone="error">The geometry could not be loaded: {geometry.error.message}</Notice>}
          {schedule.isError && <Notice tone="error">The schedule could not be loaded: {schedule.error.message}</Notice>}
          {geometry.data && schedule.data && (
            <>
              <GeometryView points={points} lines={geometry.data.lines} statusByPointId={statusByPointId} highlightPointId={selected} onPointClick={setSelected} height={460} />
              {points.length > 0 && (
                <p className="mt-2 text-xs text-[var(--muted)]">
                  Each point shows the least finished state of its schedule entries (flagged, then in progress, planned, skipped, done). Click a point to see its entries; drag to turn the view.
                </p>
              )}
              {points.length === 0 && canLead && (
                <p className="mt-2 text-sm">
                  <Link to="plan" className="text-accent hover:underline">
                    Add points on the Plan tab
                  </Link>
                </p>
              )}
            </>
          )}
        </Panel>
        <div className="space-y-4">
          {flagged.length > 0 && (
            <Panel title={<>Flagged, and why <span className="num font-normal text-[var(--muted)]">({flagged.length})</span></>}>
              <ul className="space-y-2" data-testid="flagged-list">
                {flagged.map((e) => (
                  <li key={e.id} data-entry={e.id} className="space-y-1">
                    <p className="flex flex-wrap items-baseline justify-between gap-2 text-sm">
                      <span className="num font-medium">
                        {e.excitationDof} → {e.responseDof}
                      </span>
                      <Link to={`../tap?entry=${e.id}`} className="text-xs text-accent hover:underline">
                        Open on Tap
                      </Link>
                    </p>
                    {e.flagReasons.length > 0 ? <FlagReasons reasons={e.flagReasons} compact /> : <p className="text-xs text-[var(--muted)]">Flagged by hand{e.note ? `: ${e.note}` : ''}.</p>}
                  </li>
                ))}
              </ul>
            </Panel>
          )}
          <Panel title={selectedPoint ? <>Point <span className="num">{selectedPoint.label}</span></> : 'Selected point'}>
            {!selectedPoint && <p className="text-sm text-[var(--muted)]">Click a point in the 3D view to see its schedule entries.</p>}
            {selectedPoint && (
              <div className="space-y-2 text-sm" data-testid="point-details">
                <p className="num text-xs text-[var(--muted)]">
                  x {selectedPoint.x} mm · y {selectedPoint.y} mm · z {selectedPoint.z} mm
                </p>
                {selectedEntries.length === 0 && <p className="text-[var(--muted)]">This point has no schedule entries.</p>}
                {selectedEntries.length > 0 && (
                  <table className="w-full">
                    <thead className="text-left text-xs text-[var(--muted)]">
                      <tr>
                        <th className="py-1 font-medium">Response / excitation</th>
                        <th className="font-medium">Status</th>
                        <th className="text-right font-medium">Accepted</th>
                        <th className="pl-2 text-right font-medium">Rejected</th>
                      </tr>
                    </thead>
                    <tbody>
                      {selectedEntries.flatMap((e) => [
                        <tr key={e.id} className="border-t border-[var(--line)]">
                          <td className="num py-1 text-xs">
                            {e.responseDof} / {e.excitationDof}
                          </td>
                          <td>
                            <ScheduleStatusBadge status={e.status} />
                          </td>
                          <td className="num text-right text-xs whitespace-nowrap">
                            {e.acceptedHits} / {e.requiredHits}
                          </td>
                          <td className="num pl-2 text-right text-xs">{e.rejectedHits}</td>
                        </tr>,
                        e.flagReasons.length > 0 && (
                          <tr key={`${e.id}-why`}>
                            <td colSpan={4} className="pb-1">
                              <FlagReasons reasons={e.flagReasons} compact />
                            </td>
                          </tr>
                        ),
                      ])}
                    </tbody>
                  </table>
                )}
              </div>
            )}
          </Panel>
          <Panel title="Schedule by status">
            {schedule.data && entries.length === 0 && <p className="text-sm text-[var(--muted)]">No schedule yet. The lead generates it on the Plan tab from the test type and the reference DOFs.</p>}
            {entries.length > 0 && (
              <ul className="space-y-1 text-sm" data-testid="status-counts">
                {scheduleStatuses.map((s) => (
                  <li key={s} className="flex items-center justify-between">
                    <ScheduleStatusBadge status={s} />
                    <span className="num">{counts[s]}</span>
                  </li>
                ))}
                <li className="flex items-center justify-between border-t border-[var(--line)] pt-1 font-medium">
                  <span>All DOF pairs</span>
                  <span className="num">{entries.length}</span>
                </li>
              </ul>
            )}
          </Panel>
          <Panel title="Who is assigned where">
            {entries.length === 0 && <p className="text-sm text-[var(--muted)]">Nothing to assign until the schedule exists.</p>}
            {assignments.length > 0 && (
              <ul className="space-y-2 text-sm">
                {assignments.map((a) => {
                  const open = a.entries.filter((e) => e.status !== 'done' && e.status !== 'skipped').length;
                  const labels = [...new Set(a.entries.map((e) => (campaign.testType === 'roving-response' ? e.responseLabel : e.excitationLabel)))];
                  return (
                    <li key={a.name}>
                      <div className="flex justify-between gap-2">
                        <span className="font-medium">{a.name}</span>
                        <span className="num text-xs text-[var(--muted)]">
                          {open} open of {a.entries.length}
                        </span>
                      </div>
                      <p className="num truncate text-xs text-[var(--muted)]" title={labels.join(', ')}>
                        {labels.slice(0, 12).join(' ')}
                        {labels.length > 12 ? ` +${labels.length - 12}` : ''}
                      </p>
                    </li>
                  );
                })}
              </ul>
            )}
          </Panel>
        </div>
      </div>
      {kit.isError && <Notice tone="error">The kit could not be loaded: {kit.error.message}</Notice>}
      <p className="sr-only">Marker shapes: {scheduleStatuses.map((s) => `${scheduleLook[s].label} ${scheduleLook[s].symbol}`).join(', ')}.</p>
    </div>
  );
}

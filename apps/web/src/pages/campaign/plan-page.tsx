// Plan: campaign settings, geometry (table, CSV import, 3D preview), the FE model (versions, map,
// proposal), the schedule, and the people.
import { useParams } from 'react-router';
import { useGeometry, useMembers, useSchedule } from '../../lib/campaign-data.ts';
import { GeometryView } from '../../components/geometry-view.tsx';
import { Notice, Panel, Spinner } from '../../components/ui.tsx';
import { useCampaignContext } from './campaign-context.ts';
import { CampaignSettingsCard } from './plan/campaign-settings-card.tsx';
import { GeometryTable } from './plan/geometry-table.tsx';
import { GeometryImport } from './plan/geometry-import.tsx';
import { ScheduleList } from './plan/schedule-list.tsx';
import { MembersCard } from './plan/members-card.tsx';
import { ModelSection } from './plan/model-section.tsx';
import { LifecycleCard } from './campaign-lifecycle.tsx';

export function PlanPage() {
  const { campaignId = '' } = useParams();
  const { campaign, canLead } = useCampaignContext();
  const geometry = useGeometry(campaignId);
  const schedule = useSchedule(campaignId);
  const members = useMembers(campaignId);

  return (
    <div className="space-y-4">
      <CampaignSettingsCard campaign={campaign} canLead={canLead} />
      <div className="grid gap-4 xl:grid-cols-[minmax(0,3fr)_minmax(0,2fr)]">
        <div className="min-w-0 space-y-4">
          {geometry.isPending && (
            <Panel title="Points">
              <Spinner label="Loading the geometry…" />
            </Panel>
          )}
          {geometry.isError && <Notice tone="error">The geometry could not be loaded: {geometry.error.message}</Notice>}
          {geometry.data && <GeometryTable campaignId={campaignId} points={geometry.data.points} lines={geometry.data.lines} canLead={canLead} />}
          {canLead && <GeometryImport campaignId={campaignId} />}
        </div>
        <div className="min-w-0 space-y-4">
          <Panel
            title="3D preview"
            actions={
              <a href={`/api/campaigns/${campaignId}/geometry/export.csv`} download="geometry.csv" className="text-sm text-accent-strong hover:underline">
                Export CSV
              </a>
            }
          >
            {geometry.data ? <GeometryView points={geometry.data.points.filter((p) => !p.retired)} lines={geometry.data.lines} height={360} /> : <Spinner label="Loading…" />}
          </Panel>
        </div>
      </div>
      <ModelSection campaignId={campaignId} campaign={campaign} canLead={canLead} />
      {schedule.isPending && <Spinner label="Loading the schedule…" />}
      {schedule.isError && <Notice tone="error">The schedule could not be loaded: {schedule.error.message}</Notice>}
      {schedule.data && <ScheduleList campaignId={campaignId} entries={schedule.data.entries} members={members.data?.members ?? []} canLead={canLead} />}
      {members.isPending && <Spinner label="Loading the members…" />}
      {members.isError && <Notice tone="error">The members could not be loaded: {members.error.message}</Notice>}
      {members.data && <MembersCard campaignId={campaignId} members={members.data.members} canLead={canLead} />}
      {canLead && <LifecycleCard campaign={campaign} />}
    </div>
  );
}

// Hand-over (design.md step 6): the printable report for everyone; for leads and admins the data
// bundles, sharing by e-mail, and backup and restore. Viewers see the report link only.
import { useParams } from 'react-router';
import { Panel } from '../../components/ui.tsx';
import { ReportPanel } from '../../components/handover/report-panel.tsx';
import { BundlePanel } from '../../components/handover/bundle-panel.tsx';
import { SharePanel } from '../../components/handover/share-panel.tsx';
import { BackupPanel } from '../../components/handover/backup-panel.tsx';
import { CorrelationPanel } from '../../components/model/correlation-panel.tsx';
import { useCampaignContext } from './campaign-context.ts';

export function HandoverPage() {
  const { campaignId = '' } = useParams();
  // Exports and sharing only read the campaign, so a lead has them on an archived campaign too.
  const { isLead: canLead } = useCampaignContext();

  return (
    <div className="space-y-4" data-testid="handover">
      <div className="grid gap-4 lg:grid-cols-2">
        <Panel title="Report">
          <ReportPanel campaignId={campaignId} canLead={canLead} />
        </Panel>
        <Panel title="Traceability">
          <p className="text-sm">
            Every number in the hand-over traces back to the hits and the settings that produced it: FRFs to their accepted hits, modes to the fit's band, FRFs and chosen poles. The report's appendix lists the hashes of each input, so a result can be checked against the raw data at any time.
          </p>
          <p className="mt-2 text-xs text-[var(--muted)]">Fitted modes describe this test set-up; decisions about the structure belong to licensed practice under local codes.</p>
        </Panel>
      </div>
      <CorrelationPanel campaignId={campaignId} />
      {canLead ? (
        <>
          <Panel title="Data bundles">
            <BundlePanel campaignId={campaignId} />
          </Panel>
          <Panel title="Share with stakeholders">
            <SharePanel campaignId={campaignId} />
          </Panel>
          <Panel title="Backup and restore">
            <BackupPanel campaignId={campaignId} />
          </Panel>
        </>
      ) : (
        <p className="text-sm text-[var(--muted)]">The campaign's lead exports the data bundles and shares the hand-over.</p>
      )}
    </div>
  );
}

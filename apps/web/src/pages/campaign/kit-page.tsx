// Kit: calibration warnings, hammers and accelerometers, the channel map and the acquisition settings.
import { useParams } from 'react-router';
import { useChannels, useKit, useSettings } from '../../lib/campaign-data.ts';
import { Notice, Panel, Spinner } from '../../components/ui.tsx';
import { useCampaignContext } from './campaign-context.ts';
import { WarningList } from './kit/warning-list.tsx';
import { KitItems } from './kit/kit-items.tsx';
import { ChannelMap } from './kit/channel-map.tsx';
import { InputScaling } from './kit/input-scaling.tsx';
import { AcquisitionSettingsCard } from './kit/acquisition-settings.tsx';
import { KitPolicyCard } from './kit/kit-policy-card.tsx';
import { LabBookings } from './kit/lab-bookings.tsx';

export function KitPage() {
  const { campaignId = '' } = useParams();
  const { canLead } = useCampaignContext();
  const kit = useKit(campaignId);
  const channels = useChannels(campaignId);
  const settings = useSettings(campaignId);

  return (
    <div className="space-y-4">
      {kit.isPending && <Spinner label="Loading the kit…" />}
      {kit.isError && <Notice tone="error">The kit could not be loaded: {kit.error.message}</Notice>}
      {kit.data && (
        <>
          {kit.data.warnings.length > 0 && <WarningList warnings={kit.data.warnings} />}
          <KitItems campaignId={campaignId} items={kit.data.items} canLead={canLead} />
        </>
      )}
      <LabBookings campaignId={campaignId} canLead={canLead} />
      <KitPolicyCard campaignId={campaignId} canLead={canLead} />
      {channels.isPending && <Spinner label="Loading the channel map…" />}
      {channels.isError && <Notice tone="error">The channel map could not be loaded: {channels.error.message}</Notice>}
      {channels.data && kit.data && <ChannelMap campaignId={campaignId} channels={channels.data.channels} items={kit.data.items} canLead={canLead} />}
      {channels.data && <InputScaling campaignId={campaignId} channels={channels.data.channels} canLead={canLead} />}
      {settings.isPending && (
        <Panel title="Acquisition settings">
          <Spinner label="Loading the acquisition settings…" />
        </Panel>
      )}
      {settings.isError && <Notice tone="error">The acquisition settings could not be loaded: {settings.error.message}</Notice>}
      {settings.data && <AcquisitionSettingsCard campaignId={campaignId} data={settings.data} canLead={canLead} />}
    </div>
  );
}

// Change notices per campaign, pushed to open Server-Sent-Events streams so other members see a
// new hit or verdict within a second (issue 5). One process: an in-memory emitter is enough.
import { EventEmitter } from 'node:events';

export interface CampaignEvent {
  type: 'hit' | 'verdict' | 'schedule' | 'arming';
  entryId?: string;
  at: string;
}

export class CampaignEvents {
  private readonly emitter = new EventEmitter();
  constructor() {
    this.emitter.setMaxListeners(0);
  }
  publish(campaignId: string, event: Omit<CampaignEvent, 'at'>) {
    this.emitter.emit(campaignId, { ...event, at: new Date().toISOString() });
  }
  subscribe(campaignId: string, listener: (e: CampaignEvent) => void): () => void {
    this.emitter.on(campaignId, listener);
    return () => this.emitter.off(campaignId, listener);
  }
}

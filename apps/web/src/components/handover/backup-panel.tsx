// Backup and restore: leads download a complete backup of the campaign (raw hits included);
// admins and leads restore a backup file as a new campaign, uploaded with progress.
import { useRef, useState } from 'react';
import { Link } from 'react-router';
import { useQueryClient } from '@tanstack/react-query';
import { ApiError } from '../../lib/api.ts';
import { useToast } from '../../lib/toast.tsx';
import { uploadFile, type Progress } from '../../lib/transfer.ts';
import { Button, Notice } from '../ui.tsx';
import { TransferProgress } from './transfer-progress.tsx';
import { useDownload } from './use-download.ts';

interface RestoreAnswer {
  campaign?: { id: string; name?: string };
  campaignId?: string;
  id?: string;
  name?: string;
}

export function BackupPanel({ campaignId }: { campaignId: string }) {
  const backup = useDownload();
  const toast = useToast();
  const client = useQueryClient();
  const input = useRef<HTMLInputElement>(null);
  const [file, setFile] = useState<File | null>(null);
  const [upload, setUpload] = useState<Progress | null>(null);
  const [restored, setRestored] = useState<{ id: string; name: string } | null>(null);
  const [error, setError] = useState<string | null>(null);

  const restore = async () => {
    if (!file) return;
    setError(null);
    setRestored(null);
    setUpload({ loaded: 0, total: file.size });
    try {
      const answer = await uploadFile<RestoreAnswer>('/campaigns/restore', file, setUpload);
      const id = answer?.campaign?.id ?? answer?.campaignId ?? answer?.id;
      const name = answer?.campaign?.name ?? answer?.name ?? 'the restored campaign';
      if (id) setRestored({ id, name });
      void client.invalidateQueries({ queryKey: ['campaigns'] });
      toast('ok', `Backup restored as ${name}.`);
      setFile(null);
      if (input.current) input.current.value = '';
    } catch (err) {
      const message = err instanceof ApiError ? err.message : (err as Error).message;
      setError(message);
      toast('error', `The backup was not restored: ${message}`);
    } finally {
      setUpload(null);
    }
  };

  return (
    <div className="grid gap-4 md:grid-cols-2">
      <div className="space-y-2">
        <h3 className="text-sm font-semibold">Backup</h3>
        <p className="text-sm text-[var(--muted)]">Everything in this campaign, raw hits included, in one file that a Resonote instance can restore.</p>
        <Button type="button" variant="secondary" disabled={backup.busy} onClick={() => void backup.start(`/campaigns/${campaignId}/backup`, 'campaign-backup')}>
          <span aria-hidden>⤓</span>
          Download backup
        </Button>
        {backup.progress && <TransferProgress progress={backup.progress} label="Downloading the backup" />}
      </div>
      <div className="space-y-2">
        <h3 className="text-sm font-semibold">Restore</h3>
        <p className="text-sm text-[var(--muted)]">A backup file becomes a new campaign; the existing ones are not touched.</p>
        <label className="flex flex-col gap-1 text-sm font-medium" htmlFor="restore-file">
          Backup file
          <input
            ref={input}
            id="restore-file"
            type="file"
            className="text-sm font-normal file:mr-3 file:min-h-10 file:rounded-md file:border file:border-[var(--line)] file:bg-[var(--panel)] file:px-3 file:text-sm file:text-[var(--ink)]"
            onChange={(e) => setFile(e.target.files?.[0] ?? null)}
          />
        </label>
        <Button type="button" disabled={!file || upload !== null} onClick={() => void restore()}>
          {upload ? 'Restoring…' : 'Restore as a new campaign'}
        </Button>
        {upload && <TransferProgress progress={upload} label={upload.total && upload.loaded >= upload.total ? 'Uploaded; the server is restoring…' : 'Uploading the backup'} />}
        {error && <Notice tone="error">{error}</Notice>}
        {restored && (
          <Notice tone="ok">
            Restored.{' '}
            <Link to={`/campaigns/${restored.id}`} className="font-medium underline">
              Open {restored.name}
            </Link>
          </Notice>
        )}
      </div>
    </div>
  );
}

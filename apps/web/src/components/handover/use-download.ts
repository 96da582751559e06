// A download with its progress and its outcome as a toast; one at a time per button.
import { useState } from 'react';
import { ApiError } from '../../lib/api.ts';
import { useToast } from '../../lib/toast.tsx';
import { downloadFile, formatBytes, type Progress } from '../../lib/transfer.ts';

export function useDownload() {
  const toast = useToast();
  const [progress, setProgress] = useState<Progress | null>(null);
  const start = async (path: string, fallbackName: string) => {
    setProgress({ loaded: 0, total: null });
    try {
      const { name, bytes } = await downloadFile(path, fallbackName, setProgress);
      toast('ok', `Downloaded ${name} (${formatBytes(bytes)}).`);
    } catch (err) {
      toast('error', err instanceof ApiError ? err.message : `The download failed: ${(err as Error).message}`);
    } finally {
      setProgress(null);
    }
  };
  return { progress, busy: progress !== null, start };
}

// One way to report a failed action: a stale version reloads the data and says so; anything
// else shows the API's own message.
import { useQueryClient, type QueryKey } from '@tanstack/react-query';
import { ApiError } from './api.ts';
import { useToast } from './toast.tsx';

export const STALE_MESSAGE = 'Someone else changed this — reloaded. Check the current values and make your change again.';

export function useFailure() {
  const toast = useToast();
  const client = useQueryClient();
  return (err: unknown, refresh: QueryKey[] = []) => {
    if (err instanceof ApiError && err.code === 'stale-version') {
      toast('info', STALE_MESSAGE);
      for (const key of refresh) void client.invalidateQueries({ queryKey: key });
      return;
    }
    toast('error', err instanceof ApiError ? err.message : err instanceof Error ? err.message : 'The action failed.');
  };
}

// The signed-in user, shared by every screen through TanStack Query.
import { useQuery, useQueryClient } from '@tanstack/react-query';
import { api, ApiError } from './api.ts';

export interface Me {
  user: { id: string; email: string; name: string; role: 'admin' | 'member' };
  campaignCount: number;
}

export const meKey = ['me'] as const;

export function useMe() {
  return useQuery({
    queryKey: meKey,
    queryFn: async () => {
      try {
        return await api<Me>('/me');
      } catch (err) {
        if (err instanceof ApiError && err.status === 401) return null;
        throw err;
      }
    },
    staleTime: 30_000,
  });
}

export function useSignOut() {
  const client = useQueryClient();
  return async () => {
    await api('/auth/sign-out', { method: 'POST', body: {} });
    client.clear();
  };
}

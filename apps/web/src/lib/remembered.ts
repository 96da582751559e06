// A small piece of screen state remembered per signed-in user in this browser (localStorage,
// keyed by user id): which Tap panels are folded, whether the safety cautions were read.
import { useCallback, useState } from 'react';
import { useMe } from './session.ts';

const storageKey = (userId: string, name: string) => `resonote:${userId}:${name}`;

function read(key: string | null, fallback: boolean): boolean {
  if (!key) return fallback;
  try {
    const v = window.localStorage.getItem(key);
    return v === null ? fallback : v === 'true';
  } catch {
    return fallback; // storage refused (private mode): the default holds for this visit
  }
}

export function useRememberedFlag(name: string, fallback: boolean): [boolean, (value: boolean) => void] {
  const me = useMe();
  const key = me.data ? storageKey(me.data.user.id, name) : null;
  const [state, setState] = useState<{ key: string | null; value: boolean }>(() => ({ key, value: read(key, fallback) }));
  // The user may arrive after the first render: read again once the key is known.
  const value = state.key === key ? state.value : read(key, fallback);
  const set = useCallback(
    (next: boolean) => {
      setState({ key, value: next });
      if (!key) return;
      try {
        window.localStorage.setItem(key, String(next));
      } catch {
        /* not remembered; the screen still follows the click */
      }
    },
    [key],
  );
  return [value, set];
}

import { useCallback } from 'react';
import { useSearchParams } from 'react-router-dom';

/**
 * Reading and changing a page's view state (page, sort, filters) in the address, so a view can be
 * shared by link and survives reload. Values equal to their default are left out of the address.
 */
export function useUrlState<Key extends string>(defaults: Record<Key, string>) {
  const [searchParams, setSearchParams] = useSearchParams();
  const values = Object.fromEntries(
    (Object.keys(defaults) as Key[]).map((key) => [key, searchParams.get(key) ?? defaults[key]]),
  ) as Record<Key, string>;

  const update = useCallback(
    (changes: Partial<Record<Key, string>>, options: { resetPage?: boolean } = {}) => {
      setSearchParams(
        (current) => {
          const next = new URLSearchParams(current);
          for (const [key, value] of Object.entries(changes) as [Key, string | undefined][]) {
            if (value === undefined || value === '' || value === defaults[key]) next.delete(key);
            else next.set(key, value);
          }
          if (options.resetPage) next.delete('page');
          return next;
        },
        { replace: false },
      );
    },
    // The defaults are literal objects at the call site; their contents never change.
    // eslint-disable-next-line react-hooks/exhaustive-deps
    [setSearchParams],
  );
  return [values, update] as const;
}

/** A positive integer from the address, or the fallback. */
export function positiveInteger(text: string, fallback: number): number {
  const value = Number(text);
  return Number.isInteger(value) && value >= 1 ? value : fallback;
}

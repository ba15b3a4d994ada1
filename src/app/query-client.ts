import { QueryClient } from '@tanstack/react-query';
import { ApiError } from '../lib/api-client';

/**
 * The app's one query cache: the provider hands it to the screens and the route loaders prefetch into it, so
 * a page that needs its record before it can draw finds it there.
 */
export const queryClient = new QueryClient({
  defaultOptions: {
    queries: {
      retry: (count, err) => !(err instanceof ApiError && err.status >= 400 && err.status < 500) && count < 2,
      refetchOnWindowFocus: false,
    },
  },
});

/**
 * For a route loader: waits for the page's queries (`queryClient.ensureQueryData(...)`, from the cache when
 * fresh) before the route draws. A failed one is left to the page, which says in its own words that the record
 * is missing or not shared, exactly as without the loader.
 */
export async function prefetched(...loads: Promise<unknown>[]): Promise<null> {
  await Promise.allSettled(loads);
  return null;
}

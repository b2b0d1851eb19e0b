import { QueryClient } from '@tanstack/react-query';
import { ApiError } from './api.ts';

export * from './api.ts';

// The browser's one address for server data: one QueryClient for every island on a page, fetch
// helpers that turn RFC 9457 problem details into errors, and queryOptions factories per feature
// (in src/lib/client/*.ts) whose keys hold every input.

/** One client per page: islands share the cache, so two islands asking for the same data fetch once. */
export const queryClient = new QueryClient({
  defaultOptions: {
    queries: {
      staleTime: 30_000,
      refetchOnWindowFocus: false,
      // A refused request (4xx) will not succeed on a retry; a network hiccup or a 5xx may.
      retry: (count, error) =>
        count < 2 && !(error instanceof ApiError && error.status >= 400 && error.status < 500),
    },
  },
});

import { useCallback, useEffect, useState } from 'react';

/**
 * The address's search string as state: `navigate` pushes a history entry (so the back button
 * steps through earlier views), and going back or forward updates the state.
 */
export function useSearchState(
  initial: string,
): [string, (next: URLSearchParams | string, opts?: { replace?: boolean }) => void] {
  const [search, setSearch] = useState(initial);
  useEffect(() => {
    const onPop = () => setSearch(location.search);
    addEventListener('popstate', onPop);
    // The server rendered from the same address; keep in step if it changed before hydration.
    if (location.search !== initial) setSearch(location.search);
    return () => removeEventListener('popstate', onPop);
  }, [initial]);
  const navigate = useCallback(
    (next: URLSearchParams | string, opts: { replace?: boolean } = {}) => {
      const s = typeof next === 'string' ? next : next.toString();
      const search = s ? `?${s.replace(/^\?/, '')}` : '';
      if (search === location.search) return;
      if (opts.replace) history.replaceState(null, '', `${location.pathname}${search}`);
      else history.pushState(null, '', `${location.pathname}${search}`);
      setSearch(search);
    },
    [],
  );
  return [search, navigate];
}

// The overlay's selection as the address keeps it: `pick` on /windows, `records` on /windows/overlay.

/** The most records one overlay draws (more curves stop being readable). */
export const MAX_OVERLAY = 6;

const HANDLE = /^EW-\d{6,}$/;

/** Handles from a comma-separated address parameter: valid, unique, at most MAX_OVERLAY. */
export function pickedHandles(value: string | null): string[] {
  return [
    ...new Set(
      (value ?? '')
        .split(',')
        .map((h) => h.trim().toUpperCase())
        .filter((h) => HANDLE.test(h)),
    ),
  ].slice(0, MAX_OVERLAY);
}

/** The overlay of `picked`, remembering the comparison it was opened from (its filters and page). */
export function overlayHref(picked: string[], comparisonSearch: string): string {
  const p = new URLSearchParams({ records: picked.join(',') });
  const from = new URLSearchParams(comparisonSearch).toString();
  if (from) p.set('from', from);
  return `/windows/overlay?${p}`;
}

/**
 * The way back to the comparison: /windows with the query the overlay was opened from, rebuilt
 * from its parameters (never a path or another site); for an overlay opened from a shared link,
 * /windows with its records ticked.
 */
export function comparisonHref(overlaySearch: string): string {
  const here = new URLSearchParams(overlaySearch);
  const back = new URLSearchParams(here.get('from') ?? '');
  if (!here.has('from')) {
    const records = pickedHandles(here.get('records'));
    if (records.length) back.set('pick', records.join(','));
  }
  const q = back.toString();
  return q ? `/windows?${q}` : '/windows';
}

// The overlay's selection as the address keeps it: `pick` on /windows, `records` on /windows/overlay.

/** The most records one overlay draws (more curves stop being readable). */
export const MAX_OVERLAY = 6;

const HANDLE = /^EW-\d{6,}$/;

/** Handles from a comma-separated address parameter: valid, unique, at most MAX_OVERLAY. */
export function pickedHandles(value: string | null): string[] {
  return [...new Set((value ?? '').split(',').map((h) => h.trim().toUpperCase()).filter((h) => HANDLE.test(h)))].slice(0, MAX_OVERLAY);
}

// The reader's colour scheme travels in a cookie so the first paint is right without inline
// script; with no choice, the system preference applies (see global.css).

export const THEME_COOKIE = 'edgewise-theme';

export type Theme = 'light' | 'dark';

/** The scheme a cookie value names, or undefined (the system's) for anything else. */
export function themeOf(value: string | undefined): Theme | undefined {
  return value === 'dark' || value === 'light' ? value : undefined;
}

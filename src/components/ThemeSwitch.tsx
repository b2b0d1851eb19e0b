import { useEffect, useState } from 'react';
import { THEME_COOKIE, type Theme } from '#lib/shared/theme.ts';

/** Switches between light and dark, remembered in this browser. */
export default function ThemeSwitch() {
  const [theme, setTheme] = useState<Theme>('light');
  useEffect(() => {
    const set = document.documentElement.dataset.theme;
    setTheme(
      set === 'dark' || (!set && matchMedia('(prefers-color-scheme: dark)').matches)
        ? 'dark'
        : 'light',
    );
  }, []);
  const next: Theme = theme === 'dark' ? 'light' : 'dark';
  return (
    <button
      type="button"
      onClick={() => {
        document.documentElement.dataset.theme = next;
        document.cookie = `${THEME_COOKIE}=${next}; path=/; max-age=31536000; samesite=lax`;
        setTheme(next);
      }}
      className="rounded border border-rule dark:border-night-rule px-2 py-1 text-sm hover:bg-paper dark:hover:bg-night"
      aria-label={`Use ${next} theme`}
    >
      {theme === 'dark' ? 'Light' : 'Dark'}
    </button>
  );
}

import { describe, expect, it } from 'vitest';
import { comparisonHref, overlayHref, pickedHandles } from '#lib/client/overlay.ts';

describe('overlay addresses', () => {
  it('keeps valid, unique handles, at most six', () => {
    expect(pickedHandles('EW-000001, ew-000002,EW-000001,nope,EW-12')).toEqual([
      'EW-000001',
      'EW-000002',
    ]);
    expect(
      pickedHandles(Array.from({ length: 8 }, (_, i) => `EW-00000${i + 1}`).join(',')),
    ).toHaveLength(6);
  });

  it('goes to the overlay remembering the comparison, and back to it', () => {
    const comparison = '?electrode=gc&electrode=pt&scale=SHE&pick=EW-000001,EW-000002&offset=50';
    const href = overlayHref(['EW-000001', 'EW-000002'], comparison);
    const overlay = new URL(href, 'http://x');
    expect(overlay.pathname).toBe('/windows/overlay');
    expect(overlay.searchParams.get('records')).toBe('EW-000001,EW-000002');
    const back = new URL(comparisonHref(overlay.search), 'http://x');
    expect(back.pathname).toBe('/windows');
    expect(back.searchParams.getAll('electrode')).toEqual(['gc', 'pt']);
    expect(back.searchParams.get('pick')).toBe('EW-000001,EW-000002');
    expect(back.searchParams.get('offset')).toBe('50');
  });

  it('never leaves /windows, whatever the remembered query holds', () => {
    for (const from of [
      '//evil.test/x',
      'https://evil.test',
      '/admin?x=1',
      '%2F%2Fevil.test',
      'a=1#frag',
    ]) {
      const href = comparisonHref(`?records=EW-000001&from=${encodeURIComponent(from)}`);
      expect(href.startsWith('/windows')).toBe(true);
      expect(new URL(href, 'http://x').host).toBe('x');
    }
  });

  it('ticks the records of a shared overlay link', () => {
    expect(comparisonHref('?records=EW-000003,EW-000004')).toBe(
      '/windows?pick=EW-000003%2CEW-000004',
    );
    expect(comparisonHref('')).toBe('/windows');
  });
});

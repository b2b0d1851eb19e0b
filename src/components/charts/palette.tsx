// One colour per electrode material, the same on every chart (ladder, overlay, water chart,
// spread): a reader who learns "glassy carbon is blue" on one page can trust it on the next.
// Hues follow Okabe & Ito's palette for colour-vision deficiencies ("Color Universal Design",
// 2008, from memory), darkened for the light scheme and lightened for the dark one so each keeps
// at least 3:1 against the panel; the values live in global.css (--electrode-1 … --electrode-8).

/** Materials with a fixed place: the common comparisons get the most distinct pairs (blue/orange first). */
const FIXED: Record<string, number> = {
  'glassy-carbon': 1,
  'activated-carbon': 2,
  platinum: 3,
  gold: 4,
  graphite: 5,
  'carbon-black': 6,
  'stainless-steel': 7,
  bdd: 8,
};

/** The palette place (1–8) of an electrode material: fixed for the usual ones, from the id's letters for the rest. */
export function electrodeSlot(materialId: string): number {
  const fixed = FIXED[materialId];
  if (fixed) return fixed;
  let h = 0;
  for (const ch of materialId) h = (h * 31 + ch.charCodeAt(0)) >>> 0;
  return (h % 8) + 1;
}

/** The colour of an electrode material, as a CSS value that follows the colour scheme. */
export function electrodeColour(materialId: string): string {
  return `var(--electrode-${electrodeSlot(materialId)})`;
}

/** Dash patterns that tell apart curves sharing one electrode colour (first solid). */
export const DASHES = [undefined, '6 3', '2 3', '8 3 2 3', '1 2', '10 4'] as const;

/** A key of electrode colours: one swatch and name per material shown. */
export function ElectrodeLegend({
  items,
  className = '',
}: {
  items: { id: string; name: string }[];
  className?: string;
}) {
  const seen = new Set<string>();
  const unique = items.filter((i) => !seen.has(i.id) && seen.add(i.id));
  if (unique.length === 0) return null;
  return (
    <ul
      className={`flex flex-wrap gap-x-4 gap-y-1 text-sm ${className}`}
      aria-label="Electrode colours"
      data-testid="electrode-legend"
    >
      {unique.map((i) => (
        <li key={i.id} className="flex items-center gap-1.5" data-electrode={i.id}>
          <svg width="14" height="14" aria-hidden="true" className="shrink-0">
            <rect width="14" height="14" rx="3" fill={electrodeColour(i.id)} />
          </svg>
          {i.name}
        </li>
      ))}
    </ul>
  );
}

// Figures leave the page as files: the SVG with its computed colours written in (the page's CSS
// does not travel with it), and a PNG drawn from that SVG at twice the screen size.

const PROPS = [
  'fill',
  'stroke',
  'stroke-width',
  'stroke-dasharray',
  'opacity',
  'font-family',
  'font-size',
  'font-weight',
] as const;

/** A standalone copy of an on-screen SVG, colours and fonts inlined. */
export function standaloneSvg(svg: SVGSVGElement): string {
  const clone = svg.cloneNode(true) as SVGSVGElement;
  const from = [svg, ...svg.querySelectorAll('*')];
  const to = [clone, ...clone.querySelectorAll('*')];
  from.forEach((el, i) => {
    const cs = getComputedStyle(el);
    const target = to[i] as SVGElement | undefined;
    if (!target) return;
    for (const p of PROPS) {
      const v = cs.getPropertyValue(p);
      if (v) target.setAttribute(p, v);
    }
    target.removeAttribute('class');
  });
  clone.setAttribute('xmlns', 'http://www.w3.org/2000/svg');
  // A background, so the figure reads the same wherever it is pasted.
  const bg = document.createElementNS('http://www.w3.org/2000/svg', 'rect');
  bg.setAttribute('width', '100%');
  bg.setAttribute('height', '100%');
  bg.setAttribute('fill', getComputedStyle(document.body).backgroundColor || '#ffffff');
  clone.insertBefore(bg, clone.firstChild);
  return new XMLSerializer().serializeToString(clone);
}

function save(blob: Blob, name: string) {
  const url = URL.createObjectURL(blob);
  const a = document.createElement('a');
  a.href = url;
  a.download = name;
  document.body.append(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 10_000);
}

export function downloadSvg(svg: SVGSVGElement, name: string): void {
  save(new Blob([standaloneSvg(svg)], { type: 'image/svg+xml' }), name);
}

export async function downloadPng(svg: SVGSVGElement, name: string, scale = 2): Promise<void> {
  const text = standaloneSvg(svg);
  const img = new Image();
  // A data: URL, which the page's image policy allows.
  let bin = '';
  for (const b of new TextEncoder().encode(text)) bin += String.fromCharCode(b);
  img.src = `data:image/svg+xml;base64,${btoa(bin)}`;
  await img.decode();
  const w = svg.width.baseVal.value;
  const h = svg.height.baseVal.value;
  const canvas = document.createElement('canvas');
  canvas.width = Math.round(w * scale);
  canvas.height = Math.round(h * scale);
  const ctx = canvas.getContext('2d');
  if (!ctx) throw new Error('no canvas');
  ctx.scale(scale, scale);
  ctx.drawImage(img, 0, 0, w, h);
  const blob = await new Promise<Blob | null>((r) => canvas.toBlob(r, 'image/png'));
  if (blob) save(blob, name);
}

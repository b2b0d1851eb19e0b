import { readFileSync } from 'node:fs';
import { execFileSync } from 'node:child_process';
import { describe, expect, it } from 'vitest';

// Astro renders the whitespace of a template as spaces, so text that starts on the line after an
// inline element's opening tag (or ends on the line before its closing tag) shows a space inside
// the element: a gap inside a link before its full stop, a button label that does not match its
// text. Templates keep inline content on the tag's own line (see .prettierignore).

const INLINE = 'a|button|span|summary|label|code|strong|em|small|abbr|time|kbd|option';
const opensThenBreaks = new RegExp(
  `<(${INLINE})\\b(?:[^>{]|\\{[^}]*\\})*>\\n\\s*(?!<(?!/)|\\{/\\*)[^\\s<]`,
  'g',
);
const breaksThenCloses = new RegExp(`[^\\s>]\\n\\s*</(${INLINE})>`, 'g');
// A full stop or comma on the line after an inline element's closing tag renders as " ." .
const closesThenPunctuation = new RegExp(`</(${INLINE})>\\n\\s*[.,;:!?]`, 'g');

function templates() {
  const files = execFileSync('git', ['ls-files', '*.astro'], { encoding: 'utf8' })
    .trim()
    .split('\n');
  return files.map((f) => {
    const text = readFileSync(f, 'utf8');
    const body = text.startsWith('---') ? text.slice(text.indexOf('---', 3) + 3) : text;
    return { f, body };
  });
}

describe('Astro templates', () => {
  it('keep text inside inline elements on the tags’ own lines', () => {
    const found = templates().flatMap(({ f, body }) =>
      [
        ...body.matchAll(opensThenBreaks),
        ...body.matchAll(breaksThenCloses),
        ...body.matchAll(closesThenPunctuation),
      ].map((m) => `${f}: ${m[0].replace(/\s+/g, ' ').slice(0, 80)}`),
    );
    expect(found).toEqual([]);
  });

  it('finds the pattern it is looking for', () => {
    const bad = '<a href="/x">\n  Contribute\n</a>.';
    expect(bad.match(opensThenBreaks)).not.toBeNull();
    expect(bad.match(breaksThenCloses)).not.toBeNull();
    expect('<a href="/x">Contribute</a>.'.match(opensThenBreaks)).toBeNull();
    expect('<a href="/x">Contribute</a>\n  .'.match(closesThenPunctuation)).not.toBeNull();
    expect('<a href="/x">Contribute</a>.'.match(closesThenPunctuation)).toBeNull();
  });
});

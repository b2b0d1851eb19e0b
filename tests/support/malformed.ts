import fc from 'fast-check';

// Malformed raw exports: a valid file mutated at random (characters inserted, deleted or replaced,
// truncated) or nonsense of any kind. Shared by the engine's property tests and the endpoint ones.

const alphabet = [
  ';',
  ',',
  '.',
  '\t',
  ' ',
  '\n',
  '\r',
  '-',
  '+',
  'e',
  'E',
  '0',
  '9',
  'x',
  'µ',
  '"',
  '\uFEFF',
  '/',
  '(',
  ')',
];

/** An arbitrary turning a valid export text into a malformed (or merely odd) one. */
export function malformedFrom(valid: string): fc.Arbitrary<string> {
  return fc
    .oneof(
      fc
        .array(
          fc.record({
            at: fc.nat(),
            del: fc.nat({ max: 5 }),
            ins: fc.string({ unit: fc.constantFrom(...alphabet), maxLength: 4 }),
          }),
          { minLength: 1, maxLength: 8 },
        )
        .map(
          (edits) => (text: string) =>
            edits.reduce(
              (t, m) =>
                t.slice(0, m.at % (t.length + 1)) +
                m.ins +
                t.slice((m.at % (t.length + 1)) + m.del),
              text,
            ),
        ),
      fc.nat().map((n) => (text: string) => text.slice(0, n % (text.length + 1))),
      fc.string({ unit: 'binary', maxLength: 200 }).map((s) => () => s),
      fc.string({ unit: fc.constantFrom(...alphabet), maxLength: 300 }).map((s) => () => s),
    )
    .map((mutate) => mutate(valid));
}

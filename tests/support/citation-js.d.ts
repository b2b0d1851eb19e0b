// Types for the parts of Citation.js the export tests use (the package ships none).
declare module '@citation-js/core' {
  export class Cite {
    constructor(data: unknown);
    data: Record<string, unknown>[];
    format(
      kind: 'bibliography' | 'citation' | 'data',
      options?: { format?: 'text' | 'html'; template?: string; lang?: string },
    ): string;
  }
}
declare module '@citation-js/plugin-csl';

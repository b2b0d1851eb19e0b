// The analysis engine: pure functions from export text (or typed arrays) to plain objects.
export * from './errors';
export * from './units';
export * from './read';
export * from './normalise';
export * from './segment';
export * from './cv';
export * from './limits';
export * from './lsv';
export * from './hold';
export * from './references';
export * from './water';
export * from './energy';
export * from './decimate';
export * from './aggregate';
export * from './analyze';
export * from './synthetic';
export * from './plan';

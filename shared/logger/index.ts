/** Logger files: layout, column mapping, timestamps in a zone, splitting into closures, clock offset, matching to visits. */
export * from './zoned-time';
export * from './logger-mapping';
export * from './text-layout';
export * from './logger-rows';
export * from './logger-text';
export * from './closure-split';
export * from './clock-offset';
export * from './visit-match';
export * from './temperature-columns';
export * from './temperature-series';

export * from './common';
export * from './derived';
export * from './entities';
export * from './field-records';
export * from './site-layout';
export * from './temperature-log';
export * from './calibration';
export * from './point-exclusion';

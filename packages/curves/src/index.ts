export * from './units.ts';
export * from './geometry.ts';

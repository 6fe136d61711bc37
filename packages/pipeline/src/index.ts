export * from './catalog.ts';

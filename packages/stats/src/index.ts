// Population statistics. Characteristic values, fits and correlation live at this level;
// control charts, change points and supplier comparison under ./monitor.
export * from './monitor/index.ts';
export { normalQuantile, normalCdf, normalPdf } from './special/normal.ts';
export { studentTQuantile, studentTCdf } from './special/student-t.ts';
export { noncentralTCdf, noncentralTSf, noncentralTQuantile } from './special/noncentral-t.ts';
export { normalToleranceFactor } from './tolerance-factor.ts';
export { en1990Kn } from './en1990-fractile.ts';
export { orderStatisticMinN, orderStatisticConfidence, orderStatisticRank } from './order-statistic-bound.ts';
export { percentile } from './percentile.ts';

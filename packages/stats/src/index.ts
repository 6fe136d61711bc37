// Population statistics. Characteristic values, fits and correlation live at this level;
// control charts, change points and supplier comparison under ./monitor.
export * from './monitor/index.ts';

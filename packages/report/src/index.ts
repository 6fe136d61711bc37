/** @fractile/report — one self-contained HTML report with build-time SVG charts. */
export type * from './types.ts';
export { DESIGN_VALUE_CAUTION } from './caution.ts';
export { renderReport } from './render-report.ts';
export { renderCurvesChart, curvesTemplate, curvesInput } from './curves-chart.ts';
export { renderHistogram, histogramTemplate, histogramInput, headlineCharacteristic, type ChartOptions } from './histogram-chart.ts';
export { renderControlChart, controlChartTemplate, controlChartInput, DATE_AXIS, type ControlChartContext } from './control-chart.ts';
export { renderComparisonChart, comparisonChartTemplate, comparisonChartInput } from './comparison-chart.ts';
export { renderSpecToSvg, renderTemplateToSvg, signalText, type TemplateInput } from './render-svg.ts';
export { escapeHtml } from './html-escape.ts';
export { propertyLabel, propertyAxisTitle, type PropertyLabel } from './property-labels.ts';
export { groupLabel, groupId } from './group-label.ts';
export { fitDensity } from './fit-density.ts';
export { freedmanDiaconisCount, histogramBins, MAX_BINS, MIN_BINS, type Histogram, type HistogramBin } from './histogram-bins.ts';
export { renderPlanningChart, planningTemplate, planningInput } from './planning-chart.ts';

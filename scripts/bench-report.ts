/**
 * Report rendering benchmark (not a timed test): the HTML report at the demo's size (12 groups,
 * 100 curves each, 12 properties, 16 control charts; invented data from the report's own sample
 * generator), rendered three times; prints wall and CPU seconds, the page size and the charts.
 *
 *   npm run bench:report
 */
import { renderReport } from '@fractile/report';
import { sampleReportData } from '../packages/report/src/testing/sample-report-data.ts';

const data = sampleReportData({ groups: 12, curvesPerGroup: 100, pointsPerCurve: 50, properties: 12, valuesPerProperty: 80, controlCharts: 16 });
for (let round = 1; round <= 3; round++) {
  const start = performance.now();
  const cpu = process.cpuUsage();
  const page = await renderReport(data);
  const wall = (performance.now() - start) / 1000;
  const used = process.cpuUsage(cpu);
  const charts = page.split('<svg ').length - 1;
  console.log(`report at demo size, round ${round}: ${wall.toFixed(2)} s wall, ${((used.user + used.system) / 1e6).toFixed(2)} s CPU, ${(page.length / 1e6).toFixed(1)} MB, ${charts} charts`);
}

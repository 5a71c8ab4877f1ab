export { LayerMetricPlot } from './LayerMetricPlot';
export { ControlChartPlot } from './ControlChartPlot';
export { ChamberSeriesPlot } from './ChamberSeriesPlot';

export { Plot, type PlotProps } from './Plot';
export { plotPalette, axis, stepTicks, wholeTicks } from './palette';

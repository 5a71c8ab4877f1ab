export { Plot, type PlotProps } from './Plot';
export { plotPalette, axis } from './palette';

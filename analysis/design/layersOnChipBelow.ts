import { type Design, type DesignLayer } from './parseDesign';

/**
 * The design layers already on the witness chip when layer `layerNo` (1-based) starts: earlier
 * layers monitored on the same chip number. A layer on a new chip starts from a bare chip; a chip
 * number that comes back continues that chip's stack.
 */
export function layersOnChipBelow(design: Design, layerNo: number): DesignLayer[] {
  const layer = designLayer(design, layerNo);
  return design.layers.filter((l) => l.layer < layerNo && l.monitor.chip === layer.monitor.chip);
}

/** The design layer numbered `layerNo` (1-based). @throws RangeError */
export function designLayer(design: Design, layerNo: number): DesignLayer {
  if (!Number.isInteger(layerNo) || layerNo < 1 || layerNo > design.layers.length) {
    throw new RangeError(`layer ${layerNo} does not exist (the design has layers 1–${design.layers.length})`);
  }
  return design.layers[layerNo - 1];
}

// The bench's 8-layer mirror, (HL)^4 at 600 nm, one witness chip.
export const benchDesignDocument = {
  format: 'fringelog.design/1',
  name: 'bench (HL)^4 mirror at 600 nm',
  referenceWavelengthNm: 600,
  substrate: 'fused-silica',
  substrateBackside: true,
  materials: { H: 'TiO2', L: 'SiO2' },
  layers: Array.from({ length: 8 }, (_, i) => ({ material: i % 2 === 0 ? 'H' : 'L', qwot: 1, monitor: { wavelengthNm: 600, mode: 'T', chip: 1, cut: 'turning-point' } })),
};

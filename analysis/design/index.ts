export * from './DesignFormatError';
export * from './schema';
export * from './parseDesign';
export * from './layersOnChipBelow';
export * from './designStackAt';
export * from './designSpectrum';
export * from './monitorCurve';

/** The physics stage: per cell-hour humidity, solar geometry, 2 m wind, globe and wet-bulb → WBGT. */
export * from './constants.ts';
export * from './status.ts';
export * from './humidity.ts';
export * from './solar-position.ts';
export * from './solar-inputs.ts';
export * from './geometry.ts';
export * from './wind.ts';
export * from './air-properties.ts';
export {
  CellState,
  prepareCell,
  solveCell,
  psychrometricWetBulb,
  setGlobe,
  globeFactors,
  GLOBE_DIAMETER_RANGE,
  ROOT_TOLERANCE_K,
  MAX_ITERATIONS,
  type GlobeFactors,
} from './liljegren-solve.ts';
export * from './kernel.ts';
export * from './block.ts';
export * from './delta-change.ts';
export * from './point-row.ts';
export * from './approximations.ts';
export * from './errors.ts';

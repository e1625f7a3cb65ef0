// The measurement engine: pure computations shared by the browser, the server and the CLI.
// Each section re-exports one module per computation.

// Errors
export * from './errors';

// Predictions
export * from './complex';
export * from './difference-amplifier';
export * from './instrumentation-amplifier';

// Tolerances and preferred values
export * from './seeded-random';
export * from './resistor-tolerance';
export * from './e-series';

// Limits and lots
export * from './limit-mask';
export * from './lot-statistics';

// Sweeps and regression against frequency
export * from './sweep-file';
export * from './cmrr-points';
export * from './frequency-fit';

// Captures: sine fits (IEEE Std 1057)
export * from './sine-fit';
export * from './spectrum-peak';
export * from './capture-fit';
export * from './capture-file';

// Sweeps from any table (column mapping, units) and from stored readings
export * from './sweep-table';

// Simulated bench instrument
export * from './simulated-amplifier';

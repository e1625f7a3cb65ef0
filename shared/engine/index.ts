// The measurement engine: pure computations shared by the browser, the server and the CLI.
// Each section re-exports one module per computation.

// Errors
export * from './errors';

// Sweeps and regression against frequency
export * from './sweep-file';
export * from './cmrr-points';
export * from './frequency-fit';

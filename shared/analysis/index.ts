// Analysis behind the browser's views (issue 5): pure computations on top of the engine, shared
// by the client, its workers and the server.

// Monte Carlo trials of a stored design, solved by the engine's node equations
export * from './circuit-trials';
export * from './trial-scratch';
export * from './percentiles';
export * from './prediction-band';

// Reading curves between their points
export * from './log-interpolation';

// Diagnosis of a measured curve against its design
export * from './diagnosis';

// Session verdicts, comparisons and lots
export * from './session-summary';
export * from './lot-summary';

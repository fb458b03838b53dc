/** Alert rules: the model, map-aware validation, replay over a channel and per-rule summaries. */
export * from './rule';
export * from './validate';
export * from './evaluate';
export * from './summary';

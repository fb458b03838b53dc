/**
 * Receiver profiles: what a listening device wants, linked to what a map broadcasts, with unit
 * conversions, the receive set export, relinking on a new revision, checks on a capture and the
 * device's own alerts. docs/receivers.md describes the formats and the rules.
 */
export * from './quantities';
export * from './units';
export * from './conversion';
export * from './profile';
export * from './names';
export * from './linking';
export * from './receive-set';
export * from './relink';
export * from './check';
export * from './device-alerts';

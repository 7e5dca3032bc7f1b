/**
 * The parts list in pure TypeScript, shared by the server and the browser (like $lib/specs): part kinds
 * (./kinds), values in the trade's notation (./values), lines as typed and as stored (./lines) and the
 * checks on a line (./checks).
 */
export * from './kinds';
export * from './values';
export * from './lines';
export * from './checks';
export * from './cost';

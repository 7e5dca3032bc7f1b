/**
 * The fixed choices the engineering functions take (topologies, rectifier arrangements), on their own so that
 * forms and pages which only list them (the spec-block fields) do not pull the amplifier and supply formulas
 * into the browser. amplifier.ts and supply.ts re-export them.
 */

/** Amplifier topologies (API.md). */
export const TOPOLOGIES = ['class-ab-chip', 'class-ab-discrete', 'class-a', 'class-d', 'valve', 'other'] as const;
/** One amplifier topology. */
export type Topology = (typeof TOPOLOGIES)[number];

/** Rectifier arrangements (API.md /tools/supply). */
export type RectifierKind = 'bridge' | 'bridge-split' | 'center-tap' | 'half-wave';
/** All rectifier kinds. */
export const RECTIFIERS = ['bridge', 'bridge-split', 'center-tap', 'half-wave'] as const;

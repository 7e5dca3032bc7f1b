/**
 * The spec-block kinds and the chassis materials as plain constants, without the kinds' zod schemas: pages
 * that only show blocks (the build page's spec block view) import these, so zod stays out of the browser.
 * $lib/specs re-exports them.
 */

/** The spec-block kinds, in the order the UI lists them. */
export const SPEC_KINDS = ['amplifier', 'supply', 'thermal', 'measurements', 'bringup'] as const;
/** One spec-block kind. */
export type SpecKind = (typeof SPEC_KINDS)[number];

/** True when `kind` is one of SPEC_KINDS. isSpecKind('supply') → true. */
export function isSpecKind(kind: unknown): kind is SpecKind {
	return typeof kind === 'string' && (SPEC_KINDS as readonly string[]).includes(kind);
}

/** Chassis materials (API.md). */
export const CHASSIS = ['metal', 'plastic', 'wood', 'none'] as const;

/**
 * Spec-block kinds: one zod schema and one derive function per kind, plus checks across blocks and the
 * parts list. Built on $lib/engineering; pure TypeScript, no I/O.
 */
import type { z } from 'zod';
import { amplifierSpec, deriveAmplifier } from './amplifier';
import { supplySpec, deriveSupply } from './supply';
import { thermalSpec, deriveThermal } from './thermal';
import { measurementsSpec, deriveMeasurements } from './measurements';
import { bringupSpec, deriveBringup } from './bringup';
import { checkBuild, SPEC_KINDS, type SpecKind, type SpecBlockInput, type PartLineInput } from './build';
import type { Check, SpecResult } from './types';

export * from './types';
export * from './amplifier';
export * from './supply';
export * from './thermal';
export * from './measurements';
export * from './bringup';
export * from './build';

/** Schema of each kind. specSchemas.supply.parse(data) → the parsed supply block. */
export const specSchemas = {
	amplifier: amplifierSpec,
	supply: supplySpec,
	thermal: thermalSpec,
	measurements: measurementsSpec,
	bringup: bringupSpec
} as const satisfies Record<SpecKind, z.ZodType>;

/**
 * Validate a block with its kind's schema (throws the ZodError) and derive its values and checks, on its own
 * (POST /api/v1/spec-check). runSpec('thermal', { powerW: 31.03, ambientC: 40, … }) → { derived: { junctionC: 130.0, … }, checks: [...] }.
 */
export function runSpec(kind: SpecKind, data: unknown): SpecResult {
	switch (kind) {
		case 'amplifier':
			return deriveAmplifier(amplifierSpec.parse(data));
		case 'supply':
			return deriveSupply(supplySpec.parse(data));
		case 'thermal':
			return deriveThermal(thermalSpec.parse(data));
		case 'measurements':
			return deriveMeasurements(measurementsSpec.parse(data));
		case 'bringup':
			return deriveBringup(bringupSpec.parse(data));
		default:
			throw new RangeError(`unknown spec kind "${String(kind)}"; use one of ${SPEC_KINDS.join(', ')}`);
	}
}

/** The cross checks of checkBuild alone. crossChecks([{ kind: 'supply', data }], [{ designators: 'C1', kind: 'capacitor', value: 0.01, ratingV: 35 }]) → [cross.cap-below-rail]. */
export function crossChecks(blocks: readonly SpecBlockInput[], parts: readonly PartLineInput[] = []): Check[] {
	return checkBuild(blocks, parts).cross;
}

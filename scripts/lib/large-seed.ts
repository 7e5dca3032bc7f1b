// What scripts/seed-large.js takes from the app (bundled through scripts/lib/app-module.js): spec-block
// variants computed by the app's own spec checks (derived values and checks exactly as an editor save
// stores them), parts values read by the app's own parser, and the find-index refresh the revision
// transaction runs. Invented figures: a handful of amplifier and supply blocks the large seed spreads
// over its builds.
import { runSpec, type SpecKind } from '$lib/specs';
import { readPartValue } from '$lib/parts/values';
import type { PartKind } from '$lib/parts/kinds';
export { refreshFindIndex } from '$lib/server/builds/find-index';

export interface SeedBlock {
	kind: SpecKind;
	title: string;
	data: Record<string, unknown>;
	derived: unknown;
	checks: unknown;
}

/** Amplifier blocks: rails (each side) × nominal load, claimed power a little under what the rails allow. */
function amplifierBlocks(): SeedBlock[] {
	const out: SeedBlock[] = [];
	for (const railV of [12, 15, 18, 22, 25, 28, 30, 35]) {
		for (const loadOhm of [4, 8]) {
			// (rail − 3 V dropout)² / 2R, rounded down to a whole watt: what a maker would write on the block.
			const powerW = Math.max(1, Math.floor(((railV - 3) ** 2 / (2 * loadOhm)) * 0.9));
			const data = {
				channels: 2,
				topology: railV >= 30 ? 'class-ab-discrete' : 'class-ab-chip',
				supply: 'split',
				railV,
				loadOhm,
				device: { maxSupplyV: 84, dropoutV: 3, junctionMaxC: 150, rthJcKPerW: 1.5, minLoadOhm: 4 },
				gain: { rfOhm: 22000, riOhm: 1000 },
				claimed: { powerW, thdPct: 0.1 }
			};
			const r = runSpec('amplifier', data);
			out.push({ kind: 'amplifier', title: 'Output stage', data, derived: r.derived, checks: r.checks });
		}
	}
	return out;
}

/** Supply blocks: transformer secondaries and sizes a small workshop buys. */
function supplyBlocks(): SeedBlock[] {
	const out: SeedBlock[] = [];
	for (const [secondaryVac, transformerVA] of [
		[9, 30],
		[12, 50],
		[15, 80],
		[18, 120],
		[22, 160],
		[25, 225],
		[18, 80],
		[22, 300]
	]) {
		const data = {
			mainsVac: 230,
			mainsHz: 50,
			transformerVA,
			secondaryVac,
			rectifier: 'bridge-split',
			diodeDropV: 0.8,
			reservoirF: 0.01,
			capRatingV: 63,
			loadCurrentA: Math.round((transformerVA / secondaryVac / 4) * 10) / 10,
			fuse: { ratingA: transformerVA >= 160 ? 2 : 1, type: 'slow' },
			chassis: 'metal',
			protectiveEarth: true,
			doubleInsulated: false,
			bleeder: { ohm: 4700 },
			regulationPct: 8
		};
		const r = runSpec('supply', data);
		out.push({ kind: 'supply', title: 'Power supply', data, derived: r.derived, checks: r.checks });
	}
	return out;
}

export function specBlockVariants(): { amplifier: SeedBlock[]; supply: SeedBlock[] } {
	return { amplifier: amplifierBlocks(), supply: supplyBlocks() };
}

/** SI value of a parts-list value as the parts editor stores it; null for kinds without one. */
export function partValueSI(text: string, kind: string): number | null {
	try {
		return readPartValue(text, kind as PartKind).value;
	} catch {
		return null;
	}
}

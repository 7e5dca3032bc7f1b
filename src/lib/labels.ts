/** Human labels for the values stored on builds; shared by pages, lists and the API's display fields. */
import type { BuildProgress, BuildStatus, Category, Licence, Topology } from '$lib/schemas/build-values';

export const CATEGORY_LABELS: Record<Category, string> = {
	'power-amp': 'Power amp',
	preamp: 'Preamp',
	'headphone-amp': 'Headphone amp',
	dac: 'DAC',
	'power-supply': 'Power supply',
	crossover: 'Crossover / speaker',
	'test-gear': 'Test gear',
	other: 'Other'
};

export const TOPOLOGY_LABELS: Record<Topology, string> = {
	'class-ab-chip': 'Class AB, chip',
	'class-ab-discrete': 'Class AB, discrete',
	'class-a': 'Class A',
	'class-d': 'Class D',
	valve: 'Valve',
	passive: 'Passive',
	other: 'Other'
};

export const STATUS_LABELS: Record<BuildStatus, string> = {
	draft: 'Draft',
	published: 'Published',
	archived: 'Archived'
};

/** The maker's build status (BUILD_PROGRESS), as cards, the build page and the filter show it. */
export const PROGRESS_LABELS: Record<BuildProgress, string> = {
	'in-progress': 'In progress',
	working: 'Working',
	abandoned: 'Abandoned'
};

export const LICENCE_LABELS: Record<Licence, string> = {
	'CC-BY-SA-4.0': 'CC BY-SA 4.0 (share alike)',
	'CC-BY-4.0': 'CC BY 4.0 (attribution)',
	'CC0-1.0': 'CC0 1.0 (public domain)',
	'CERN-OHL-S-2.0': 'CERN OHL-S 2.0 (strongly reciprocal hardware)',
	'CERN-OHL-W-2.0': 'CERN OHL-W 2.0 (weakly reciprocal hardware)',
	'CERN-OHL-P-2.0': 'CERN OHL-P 2.0 (permissive hardware)'
};

/** Label of a stored value, falling back to the value itself (for values added after this list). */
export function labelOf<K extends string>(labels: Record<K, string>, value: string | null | undefined): string {
	if (!value) return '';
	return (labels as Record<string, string>)[value] ?? value;
}

/** Caution shown wherever a mains-powered build appears (PRODUCT.md §4.11). */
export const MAINS_BUILD_CAUTION =
	'This build runs from mains voltage, and its supply capacitors hold charge after switch-off. Mains can kill: work unplugged, discharge the capacitors, and defer to local electrical codes and licensed practice.';

/** Where sign-offs and checks show: what "safe" means here. */
export const NOT_A_CERTIFICATION =
	'A sign-off as “safe” is one reviewer’s opinion of one revision, not a certification.';

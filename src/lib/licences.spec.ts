// The licence terms a build based on another must follow. Sources: CC BY-SA 4.0 legal code §3(b)
// (adaptations under the same licence, a later version or a BY-SA Compatible License); CC BY 4.0 §3(a)
// (attribution, no share-alike); CC0 1.0 (no conditions); CERN-OHL-S/W/P 2.0 (S and W reciprocal for the
// covered source, P permissive with notices kept) — the CERN-OHL section numbers from memory.
import { describe, expect, it } from 'vitest';
import { allowedLicencesFor, isShareAlike, needsAttribution } from './licences';
import { LICENCES } from '$lib/schemas/build';

describe('licence terms', () => {
	it('share-alike licences carry over unchanged', () => {
		expect(allowedLicencesFor('CC-BY-SA-4.0')).toEqual(['CC-BY-SA-4.0']);
		expect(allowedLicencesFor('CERN-OHL-S-2.0')).toEqual(['CERN-OHL-S-2.0']);
		expect(allowedLicencesFor('CERN-OHL-W-2.0')).toEqual(['CERN-OHL-W-2.0']);
		expect(['CC-BY-SA-4.0', 'CERN-OHL-S-2.0', 'CERN-OHL-W-2.0'].every(isShareAlike)).toBe(true);
	});

	it('permissive licences allow any licence we offer; an unknown one is kept as it is', () => {
		for (const l of ['CC-BY-4.0', 'CC0-1.0', 'CERN-OHL-P-2.0']) {
			expect(isShareAlike(l)).toBe(false);
			expect(allowedLicencesFor(l)).toEqual(LICENCES);
		}
		expect(allowedLicencesFor('LicenseRef-own')).toEqual(['LicenseRef-own']);
	});

	it('every licence but CC0 asks for attribution', () => {
		expect(LICENCES.filter(needsAttribution)).toEqual(LICENCES.filter((l) => l !== 'CC0-1.0'));
	});
});

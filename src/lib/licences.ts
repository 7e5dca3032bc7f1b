/**
 * What a build's licence asks of the builds based on it (PRODUCT.md §4.7). Pure; shared by the server
 * (which enforces it) and the edit form (which offers only the licences allowed).
 *
 * Share-alike licences carry over: an adaptation of a CC BY-SA 4.0 work must be licensed CC BY-SA 4.0
 * (or a later version or a compatible licence — none of the others offered here; CC BY-SA 4.0 legal
 * code §3(b)); modified sources under CERN-OHL-S 2.0 stay CERN-OHL-S (its §4.1, from memory); CERN-OHL-W 2.0
 * modifications of the covered source stay CERN-OHL-W (its §4.1, from memory; we read it conservatively and
 * do not offer a switch to OHL-S). Every licence here except CC0 asks for attribution of the original.
 */
import { LICENCES, type Licence } from '$lib/schemas/build-values';

/** Licences whose terms carry over to builds based on it. */
export const SHARE_ALIKE: readonly Licence[] = ['CC-BY-SA-4.0', 'CERN-OHL-S-2.0', 'CERN-OHL-W-2.0'];

/** True when the licence is share-alike (reciprocal). */
export function isShareAlike(licence: string): boolean {
	return (SHARE_ALIKE as readonly string[]).includes(licence);
}

/**
 * The licences a build based on one under `originLicence` may take. Share-alike → only that licence;
 * otherwise any we offer. Unknown origin licences are treated as share-alike (keep it as it is).
 * allowedLicencesFor('CC-BY-SA-4.0') → ['CC-BY-SA-4.0']; allowedLicencesFor('CC0-1.0') → all six.
 */
export function allowedLicencesFor(originLicence: string | null | undefined): readonly Licence[] {
	if (!originLicence) return LICENCES;
	if (isShareAlike(originLicence)) return [originLicence as Licence];
	if (!(LICENCES as readonly string[]).includes(originLicence)) return [originLicence as Licence];
	return LICENCES;
}

/** True when builds based on a work under this licence must credit it (all but CC0). */
export function needsAttribution(licence: string): boolean {
	return licence !== 'CC0-1.0';
}

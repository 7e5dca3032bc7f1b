/**
 * Shared test fixtures: spec blocks that pass their schema and fire no check under revision 2 (API.md).
 * Numbers from REFERENCE.md worked examples: 25-0-25 V into a bridge for ± rails with 7 % regulation (§4.2,
 * §12 case 7: off load at +10 % mains 40.81 V per rail), a ±35 V / 8 Ω chip amplifier (§1–2). Tests spread over
 * them and change the one field they are about. Not used by the application.
 */

/** A mains supply block: 300 VA, 25-0-25 V, bridge-split, 0.8 V diodes, 10 000 µF and 63 V per rail, 3.15 A slow fuse, earthed metal case, 4.7 kΩ bleeders. */
export const SUPPLY_BLOCK = Object.freeze({
	mainsVac: 230,
	mainsHz: 50,
	transformerVA: 300,
	secondaryVac: 25,
	rectifier: 'bridge-split',
	diodeDropV: 0.8,
	reservoirF: 0.01,
	capRatingV: 63,
	loadCurrentA: 3,
	fuse: Object.freeze({ ratingA: 3.15, type: 'slow' }),
	chassis: 'metal',
	protectiveEarth: true,
	doubleInsulated: false,
	bleeder: Object.freeze({ ohm: 4700 }),
	regulationPct: 7
});

/** A supply block as JSON-like data with some fields changed. supplyBlock({ fuse: null }). */
export function supplyBlock(over: Record<string, unknown> = {}): Record<string, unknown> {
	return { ...structuredClone({ ...SUPPLY_BLOCK, fuse: { ...SUPPLY_BLOCK.fuse }, bleeder: { ...SUPPLY_BLOCK.bleeder } }), ...over };
}

/** A two-channel chip amplifier block: ±35 V, 8 Ω, 3 V dropout, device rated 100 V total and 4 Ω, claimed 60 W. */
export function amplifierBlock(over: Record<string, unknown> = {}): Record<string, unknown> {
	return {
		channels: 2,
		topology: 'class-ab-chip',
		supply: 'split',
		railV: 35,
		loadOhm: 8,
		device: { maxSupplyV: 100, dropoutV: 3, junctionMaxC: 150, rthJcKPerW: 1, minLoadOhm: 4 },
		claimed: { powerW: 60, thdPct: 0.1 },
		...over
	};
}

/** A thermal block: 50 W per device, 40 °C, 1.0 + 0.4 + 0.2 K/W (junction 120 °C), insulated tab on a chassis-bonded heatsink. */
export function thermalBlock(over: Record<string, unknown> = {}): Record<string, unknown> {
	return {
		powerW: 50,
		ambientC: 40,
		junctionMaxC: 150,
		rthJcKPerW: 1,
		rthCsKPerW: 0.4,
		rthSaKPerW: 0.2,
		tabAtRail: true,
		tabInsulated: true,
		heatsinkBondedToChassis: true,
		...over
	};
}

/**
 * The spec editor's form for a supply block as a maker types it (trade notation, every field text): SUPPLY_BLOCK with
 * 50 V capacitors, no stated regulation, no bleeder and the soft-start box unticked — so a build made with it shows the thin capacitor margin
 * (50 V < 1.2 × 41.98 V with 10 % regulation assumed) and the missing bleeder. The end-to-end tests post it;
 * spec-forms.spec.ts checks that it reads back as supplyBlock(SUPPLY_FORM_CHANGES).
 */
export const SUPPLY_FORM_CHANGES = Object.freeze({ capRatingV: 50, regulationPct: undefined, bleeder: null, softStart: false });
/** See SUPPLY_FORM_CHANGES. */
export const SUPPLY_FORM = Object.freeze({
	kind: 'supply',
	id: '',
	title: 'Main supply',
	mainsVac: '230',
	mainsHz: '50',
	transformerVA: '300',
	secondaryVac: '25',
	mainsPowered: 'on',
	rectifier: 'bridge-split',
	diodeDropV: '0.8',
	reservoirF: '10000u',
	capRatingV: '50',
	loadCurrentA: '3',
	fuse__ratingA: '3.15',
	fuse__type: 'slow',
	chassis: 'metal',
	protectiveEarth: 'on',
	bleeder: 'none'
});

/** The amplifier spec form as a browser posts it (trade notation): ±28 V split rails into 8 Ω, 60 V / 3 V dropout device, gain 22k/680R. */
export const AMP_FORM = Object.freeze({
	channels: '2',
	topology: 'class-ab-chip',
	supply: 'split',
	railV: '28',
	loadOhm: '8R',
	device__maxSupplyV: '60',
	device__dropoutV: '3',
	device__junctionMaxC: '150',
	device__rthJcKPerW: '1',
	device__minLoadOhm: '4R',
	gain__rfOhm: '22k',
	gain__riOhm: '680R'
});

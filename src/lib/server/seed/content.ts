// The invented demo scenario: members' builds with steps, spec blocks and parts lists.
// Every name, part and figure here is made up for the demo; parts are generic descriptions.
import type { Motif } from './illustrations';
import type { DemoMemberKey } from './members';

export interface DemoStep {
	title: string;
	body: string;
	image?: { motif: Motif; alt: string };
}

export interface DemoPart {
	designators: string;
	quantity: number;
	kind: string;
	value: string;
	tolerancePct?: number;
	ratingV?: number;
	ratingW?: number;
	package?: string;
	notes?: string;
	designValue?: string;
	reason?: string;
}

export interface DemoBuild {
	key: string;
	owner: DemoMemberKey;
	slug: string;
	title: string;
	summary: string;
	category: string;
	topology: string;
	mainsPowered: boolean;
	licence: string;
	status: 'draft' | 'published';
	cover?: { motif: Motif; alt: string };
	steps: DemoStep[];
	specs: { kind: 'amplifier' | 'supply' | 'thermal' | 'measurements' | 'bringup'; data: Record<string, unknown> }[];
	parts: DemoPart[];
	/** What review state the scenario gives it. */
	review?: 'safe' | 'rework' | 'waiting' | 'safe-changed';
}

const MAINS_NOTE =
	'> Mains wiring and charged reservoirs can kill. This is a record of what I did, not instructions; follow local codes and licensed practice.';

export const DEMO_BUILDS: DemoBuild[] = [
	{
		key: 'chipamp',
		owner: 'maker',
		slug: 'stereo-power-ic-amp-28v-rails',
		title: 'Stereo power-IC amp on ±28 V rails',
		summary:
			'Two 5-pin monolithic power amplifier ICs on ±28 V rails, a 160 VA toroid, shielded input wiring and one star ground point.',
		category: 'power-amp',
		topology: 'class-ab-chip',
		mainsPowered: true,
		licence: 'CC-BY-SA-4.0',
		status: 'published',
		cover: { motif: 'chassis', alt: 'Sketch of the finished aluminium case with the volume knob and power switch on the front' },
		review: 'safe-changed',
		steps: [
			{
				title: 'Choosing the rails and the load',
				body: `I wanted about 30 W per channel into 8 Ω speakers. With a dropout of roughly 4 V per side at full current, ±28 V rails give **36 W** on paper — the amplifier spec block below does the arithmetic and the worst-case dissipation.\n\n- Load: 8 Ω nominal, the speakers dip to about 6.5 Ω\n- Gain: 23 V/V (22 kΩ / 1 kΩ)\n- Input high-pass: 22 kΩ with 1 µF, about 7 Hz`,
				image: { motif: 'scope', alt: 'Oscilloscope sketch of a clean sine wave just below clipping' }
			},
			{
				title: 'Board assembly',
				body: `Resistors first, then the film capacitors, then the electrolytics. I fitted two 1 µF film capacitors in series where the reference circuit wants 0.47 µF — the parts list records the substitution and the deviation.\n\nEach IC gets 100 nF plus 220 µF right at its supply pins.`,
				image: { motif: 'board', alt: 'Sketch of the green amplifier board with two rows of parts and two large capacitors' }
			},
			{
				title: 'Heatsinks and insulation',
				body: `The tab of this IC sits at the negative rail, so each one is mounted on a mica washer with a thin layer of thermal compound and a shoulder washer on the screw. I checked with an ohmmeter that the tab does not touch the heatsink before any power was applied.\n\nHeatsinks are 0.8 K/W each; the thermal block shows the junction estimate at 40 °C inside the case.`,
				image: { motif: 'heatsink', alt: 'Sketch of a finned heatsink with the IC mounted on an insulating washer' }
			},
			{
				title: 'Supply, earthing and first power-up',
				body: `${MAINS_NOTE}\n\nThe toroid feeds a bridge and 10 000 µF per rail. The chassis is bonded to protective earth at its own stud next to the inlet. A slow 1.6 A fuse sits in the live conductor before the switch.\n\nFirst power-up went through a series lamp with no load, then the rails and the DC offset were measured before connecting speakers.`,
				image: { motif: 'transformer', alt: 'Sketch of a toroidal transformer with its secondary leads' }
			}
		],
		specs: [
			{
				kind: 'amplifier',
				data: {
					channels: 2,
					topology: 'class-ab-chip',
					supply: 'split',
					railV: 28,
					loadOhm: 8,
					device: { maxSupplyV: 84, dropoutV: 4, junctionMaxC: 150, rthJcKPerW: 1, minLoadOhm: 4, maxOutputCurrentA: 11 },
					gain: { rfOhm: 22000, riOhm: 1000 },
					input: { rOhm: 22000, cF: 1e-6 },
					claimed: { powerW: 33, thdPct: 1 },
					quiescentA: 0.05
				}
			},
			{
				kind: 'supply',
				data: {
					mainsVac: 230,
					mainsHz: 50,
					transformerVA: 160,
					secondaryVac: 20,
					rectifier: 'bridge-split',
					diodeDropV: 0.8,
					reservoirF: 0.01,
					capRatingV: 50,
					loadCurrentA: 1.5,
					fuse: { ratingA: 1.6, type: 'slow' },
					chassis: 'metal',
					protectiveEarth: true,
					doubleInsulated: false,
					bleeder: { ohm: 4700 },
					regulationPct: 6,
					amplifierDemandW: 72
				}
			},
			{
				kind: 'thermal',
				data: {
					powerW: 36,
					ambientC: 40,
					junctionMaxC: 150,
					rthJcKPerW: 1,
					rthCsKPerW: 0.4,
					rthSaKPerW: 0.8,
					tabAtRail: true,
					tabInsulated: true,
					heatsinkBondedToChassis: true
				}
			},
			{
				kind: 'measurements',
				data: {
					dcOffsetMv: [6, -9],
					noiseUv: 60,
					loadOhm: 8,
					points: {
						response: [
							{ freqHz: 5, db: -5.1 },
							{ freqHz: 10, db: -1.6 },
							{ freqHz: 20, db: -0.5 },
							{ freqHz: 100, db: 0 },
							{ freqHz: 1000, db: 0 },
							{ freqHz: 10000, db: -0.1 },
							{ freqHz: 20000, db: -0.3 },
							{ freqHz: 50000, db: -1.4 },
							{ freqHz: 100000, db: -3.2 }
						],
						thd: [
							{ powerW: 0.25, thdPct: 0.012 },
							{ powerW: 1, thdPct: 0.008 },
							{ powerW: 5, thdPct: 0.006 },
							{ powerW: 15, thdPct: 0.009 },
							{ powerW: 25, thdPct: 0.02 },
							{ powerW: 30, thdPct: 0.08 },
							{ powerW: 33, thdPct: 1.0 }
						]
					}
				}
			},
			{
				kind: 'bringup',
				data: {
					currentLimited: true,
					rails: [
						{ label: '+V', expectedV: 28, measuredV: 27.4 },
						{ label: '−V', expectedV: -28, measuredV: -27.6 }
					],
					dcOffsetMv: [6, -9],
					oscillationChecked: true,
					oscillationFound: false,
					heatSoak: { minutes: 60, sinkC: 52 }
				}
			}
		],
		parts: [
			{ designators: 'U1, U2', quantity: 2, kind: 'ic', value: '5-pin monolithic power amplifier IC', package: 'TO-220-5', notes: 'Tab at the negative rail: insulate' },
			{ designators: 'R1, R2', quantity: 2, kind: 'resistor', value: '22k', tolerancePct: 1, ratingW: 0.25, package: 'axial', notes: 'Feedback Rf' },
			{ designators: 'R3, R4', quantity: 2, kind: 'resistor', value: '1k', tolerancePct: 1, ratingW: 0.25, package: 'axial', notes: 'Feedback Ri' },
			{ designators: 'R5, R6', quantity: 2, kind: 'resistor', value: '22k', tolerancePct: 1, ratingW: 0.25, package: 'axial', notes: 'Input to ground' },
			{ designators: 'C1, C2', quantity: 2, kind: 'capacitor', value: '1u', tolerancePct: 10, ratingV: 63, package: 'film 5 mm', notes: 'Input coupling' },
			{ designators: 'C3a, C3b, C4a, C4b', quantity: 4, kind: 'capacitor', value: '2×1u series', designValue: '470n', tolerancePct: 10, ratingV: 63, package: 'film 5 mm', notes: 'Two in series per channel', reason: 'Had 1 µF film on hand; two in series give 0.5 µF' },
			{ designators: 'C5, C6', quantity: 2, kind: 'capacitor', value: '10000u', tolerancePct: 20, ratingV: 50, package: 'snap-in 30 mm', notes: 'Reservoirs, one per rail' },
			{ designators: 'C7–C10', quantity: 4, kind: 'capacitor', value: '100n', tolerancePct: 10, ratingV: 100, package: 'film 5 mm', notes: 'Local bypass' },
			{ designators: 'R7, R8', quantity: 2, kind: 'resistor', value: '2R2', designValue: '2R7', tolerancePct: 5, ratingW: 1, package: 'axial', notes: 'Zobel resistor', reason: 'Closest value in the drawer' },
			{ designators: 'R9, R10', quantity: 2, kind: 'resistor', value: '4k7', tolerancePct: 5, ratingW: 1, package: 'axial', notes: 'Bleeders across the reservoirs' },
			{ designators: 'F1', quantity: 1, kind: 'fuse', value: 'T1.6A', package: '5 × 20 mm', notes: 'Slow, in the live conductor at the inlet' },
			{ designators: 'T1', quantity: 1, kind: 'transformer', value: '160 VA 2 × 20 V toroid', notes: 'Soft-start not fitted at this size' }
		]
	},
	{
		key: 'headphone',
		owner: 'maker2',
		slug: 'quiet-class-a-headphone-amp',
		title: 'Quiet class A headphone amp',
		summary: 'A discrete single-ended class A stage with a follower output for 32–300 Ω headphones, on ±15 V.',
		category: 'headphone-amp',
		topology: 'class-a',
		mainsPowered: true,
		licence: 'CC-BY-4.0',
		status: 'published',
		cover: { motif: 'board', alt: 'Sketch of the small headphone amplifier board' },
		review: 'rework',
		steps: [
			{
				title: 'Bias and the output followers',
				body: 'Each channel idles at 100 mA through the output follower. That is 3 W per transistor, all the time — class A runs hot whether music plays or not.',
				image: { motif: 'heatsink', alt: 'Sketch of two small heatsinks with output transistors' }
			},
			{
				title: 'Small heatsinks inside the case',
				body: 'I used small clip-on heatsinks of about 12 K/W because the case is narrow. The thermal block says the junction runs warm — I am asking reviewers whether that is acceptable.'
			},
			{
				title: 'Supply',
				body: `${MAINS_NOTE}\n\nA 25 VA transformer, a bridge and 4700 µF per rail, followed by two regulators.`,
				image: { motif: 'caps', alt: 'Sketch of a row of reservoir capacitors on a copper bus bar' }
			}
		],
		specs: [
			{
				kind: 'amplifier',
				data: {
					channels: 2,
					topology: 'class-a',
					supply: 'split',
					railV: 15,
					loadOhm: 32,
					device: { maxSupplyV: 40, dropoutV: 3, junctionMaxC: 150, rthJcKPerW: 2.5, minLoadOhm: 16 },
					gain: { rfOhm: 4700, riOhm: 1000 },
					biasA: 0.1,
					classA: 'single-ended',
					regulatedRails: true,
					claimed: { powerW: 0.5, thdPct: 0.1 }
				}
			},
			{
				kind: 'thermal',
				data: {
					powerW: 3.3,
					ambientC: 45,
					junctionMaxC: 150,
					rthJcKPerW: 2.5,
					rthCsKPerW: 1,
					rthSaKPerW: 12,
					tabAtRail: true,
					tabInsulated: true,
					heatsinkBondedToChassis: false
				}
			},
			{
				kind: 'supply',
				data: {
					mainsVac: 230,
					mainsHz: 50,
					transformerVA: 25,
					secondaryVac: 15,
					rectifier: 'bridge-split',
					diodeDropV: 0.7,
					reservoirF: 0.0047,
					capRatingV: 35,
					loadCurrentA: 0.25,
					fuse: { ratingA: 0.25, type: 'slow' },
					chassis: 'metal',
					protectiveEarth: true,
					doubleInsulated: false,
					bleeder: true
				}
			}
		],
		parts: [
			{ designators: 'Q1, Q2', quantity: 2, kind: 'transistor', value: 'NPN power transistor', package: 'TO-220', notes: 'Output followers' },
			{ designators: 'R1, R2', quantity: 2, kind: 'resistor', value: '10R', tolerancePct: 1, ratingW: 3, package: 'axial', notes: 'Emitter resistors' },
			{ designators: 'R3, R4', quantity: 2, kind: 'resistor', value: '4k7', tolerancePct: 1, ratingW: 0.25 },
			{ designators: 'R5, R6', quantity: 2, kind: 'resistor', value: '0R', designValue: '10R', tolerancePct: 5, ratingW: 0.25, notes: 'Output series resistor', reason: 'Wanted a lower output impedance' },
			{ designators: 'C1, C2', quantity: 2, kind: 'capacitor', value: '4700u', tolerancePct: 20, ratingV: 35, package: 'radial 18 mm' },
			{ designators: 'C3, C4', quantity: 2, kind: 'capacitor', value: '220u', tolerancePct: 20, ratingV: 25 }
		]
	},
	{
		key: 'supply',
		owner: 'maker3',
		slug: 'dual-rail-linear-supply',
		title: 'Dual-rail linear supply for amplifier boards',
		summary: 'Toroid, bridge and reservoirs for about ±30 V rails, with bleeders, in a steel case.',
		category: 'power-supply',
		topology: 'other',
		mainsPowered: true,
		licence: 'CC-BY-SA-4.0',
		status: 'published',
		cover: { motif: 'transformer', alt: 'Sketch of the toroidal transformer mounted in the case' },
		review: 'waiting',
		steps: [
			{
				title: 'Transformer and bridge',
				body: `${MAINS_NOTE}\n\nA 300 VA toroid with two 22 V secondaries feeds a 35 A bridge.`,
				image: { motif: 'transformer', alt: 'Sketch of a toroid and the bridge rectifier' }
			},
			{
				title: 'Reservoir bank',
				body: 'Two 10 000 µF capacitors per rail, 50 V rated, with 4.7 kΩ bleeders.',
				image: { motif: 'caps', alt: 'Sketch of four large capacitors on a bus bar' }
			},
			{
				title: 'Case',
				body: 'A steel case from the surplus box. I have not fitted an earth lead yet — the inlet is a two-pin type. Reviewers, please look.'
			}
		],
		specs: [
			{
				kind: 'supply',
				data: {
					mainsVac: 230,
					mainsHz: 50,
					transformerVA: 300,
					secondaryVac: 22,
					rectifier: 'bridge-split',
					diodeDropV: 0.9,
					reservoirF: 0.02,
					capRatingV: 50,
					loadCurrentA: 3,
					fuse: { ratingA: 3.15, type: 'slow' },
					chassis: 'metal',
					protectiveEarth: false,
					doubleInsulated: false,
					bleeder: { ohm: 4700 },
					amplifierDemandW: 160
				}
			}
		],
		parts: [
			{ designators: 'T1', quantity: 1, kind: 'transformer', value: '300 VA 2 × 22 V toroid' },
			{ designators: 'BR1', quantity: 1, kind: 'diode', value: '35 A bridge rectifier', package: 'square module' },
			{ designators: 'C1–C4', quantity: 4, kind: 'capacitor', value: '10000u', tolerancePct: 20, ratingV: 50, package: 'snap-in 35 mm' },
			{ designators: 'R1, R2', quantity: 2, kind: 'resistor', value: '4k7', tolerancePct: 5, ratingW: 2 },
			{ designators: 'F1', quantity: 1, kind: 'fuse', value: 'T3.15A', package: '5 × 20 mm' }
		]
	},
	{
		key: 'preamp',
		owner: 'maker2',
		slug: 'passive-preamp-with-input-selector',
		title: 'Passive preamp with a four-way input selector',
		summary: 'A log volume pot and a rotary switch in a small wooden box. No supply, no gain, no noise.',
		category: 'preamp',
		topology: 'passive',
		mainsPowered: false,
		licence: 'CC0-1.0',
		status: 'published',
		cover: { motif: 'crossover', alt: 'Sketch of the wooden preamp box seen from above' },
		review: 'safe',
		steps: [
			{
				title: 'Pot and selector',
				body: 'A 10 kΩ log pot after a four-way selector. Source output impedance must stay low, and the amplifier input should be at least ten times the pot value.',
				image: { motif: 'meter', alt: 'Sketch of a multimeter checking the pot track' }
			},
			{
				title: 'Shielded wiring',
				body: 'Shielded cable from the inputs to the selector and from the pot to the outputs, shield grounded at one end only.'
			}
		],
		specs: [
			{
				kind: 'measurements',
				data: {
					dcOffsetMv: [0, 0],
					points: {
						response: [
							{ freqHz: 20, db: 0 },
							{ freqHz: 1000, db: 0 },
							{ freqHz: 20000, db: -0.05 },
							{ freqHz: 100000, db: -0.6 }
						]
					}
				}
			}
		],
		parts: [
			{ designators: 'VR1', quantity: 1, kind: 'potentiometer', value: 'A103', notes: 'Dual gang, log taper (letter meaning differs by region — measured about 15 % at mid-rotation)' },
			{ designators: 'SW1', quantity: 1, kind: 'switch', value: '2-pole 4-way rotary' },
			{ designators: 'R1–R8', quantity: 8, kind: 'resistor', value: '100k', tolerancePct: 1, ratingW: 0.25, notes: 'Input pull-downs' }
		]
	},
	{
		key: 'crossover',
		owner: 'maker2',
		slug: 'two-way-speaker-crossover',
		title: 'Two-way speaker crossover at 2.5 kHz',
		summary: 'Second-order passive crossover for a 6.5" woofer and a 1" dome, with an L-pad on the tweeter.',
		category: 'crossover',
		topology: 'passive',
		mainsPowered: false,
		licence: 'CC-BY-4.0',
		status: 'published',
		cover: { motif: 'crossover', alt: 'Sketch of the crossover board with air-core coils' },
		steps: [
			{
				title: 'Coils and capacitors',
				body: 'Air-core coils keep distortion down; the two coils sit at right angles to each other to limit coupling.',
				image: { motif: 'crossover', alt: 'Sketch of two air-core coils and film capacitors' }
			},
			{ title: 'Listening tests', body: 'The tweeter level needed 2 dB of attenuation in my room. Measured response is in the measurements block.' }
		],
		specs: [],
		parts: [
			{ designators: 'L1', quantity: 1, kind: 'inductor', value: '560u', tolerancePct: 5, notes: 'Air core, 1.0 mm wire' },
			{ designators: 'C1', quantity: 1, kind: 'capacitor', value: '2u2||2u2', designValue: '4u7', tolerancePct: 5, ratingV: 250, package: 'film', reason: 'Two 2.2 µF in parallel from stock' },
			{ designators: 'C2', quantity: 1, kind: 'capacitor', value: '8u2', tolerancePct: 5, ratingV: 250, package: 'film' },
			{ designators: 'L2', quantity: 1, kind: 'inductor', value: '330u', tolerancePct: 5 },
			{ designators: 'R1', quantity: 1, kind: 'resistor', value: '3R3', tolerancePct: 5, ratingW: 10, package: 'ceramic', notes: 'L-pad series' },
			{ designators: 'R2', quantity: 1, kind: 'resistor', value: '10R', tolerancePct: 5, ratingW: 10, package: 'ceramic', notes: 'L-pad shunt' }
		]
	},
	{
		key: 'dac',
		owner: 'maker3',
		slug: 'usb-dac-with-linear-supply',
		title: 'DAC board with a quiet linear supply',
		summary: 'A ready-made DAC module fed by a small linear supply with low-noise regulators, in a plastic case.',
		category: 'dac',
		topology: 'other',
		mainsPowered: true,
		licence: 'CC-BY-SA-4.0',
		status: 'published',
		review: 'safe',
		cover: { motif: 'board', alt: 'Sketch of the DAC board and its supply' },
		steps: [
			{
				title: 'Supply board',
				body: `${MAINS_NOTE}\n\nA 10 VA transformer in a double-insulated plastic case, bridge, 2200 µF and two low-noise regulators.`,
				image: { motif: 'caps', alt: 'Sketch of the small supply board' }
			},
			{ title: 'Output stage', body: 'The module drives the line outputs directly through 100 Ω and a 10 µF film capacitor.' }
		],
		specs: [
			{
				kind: 'supply',
				data: {
					mainsVac: 230,
					mainsHz: 50,
					transformerVA: 10,
					secondaryVac: 9,
					rectifier: 'bridge',
					diodeDropV: 0.7,
					reservoirF: 0.0022,
					capRatingV: 25,
					loadCurrentA: 0.3,
					fuse: { ratingA: 0.1, type: 'slow' },
					regulationPct: 20,
					chassis: 'plastic',
					protectiveEarth: false,
					doubleInsulated: true,
					bleeder: true
				}
			}
		],
		parts: [
			{ designators: 'U1', quantity: 1, kind: 'other', value: 'stereo DAC module' },
			{ designators: 'U2, U3', quantity: 2, kind: 'regulator', value: 'low-noise adjustable regulator', package: 'TO-220' },
			{ designators: 'C1', quantity: 1, kind: 'capacitor', value: '2200u', tolerancePct: 20, ratingV: 25 },
			{ designators: 'C2, C3', quantity: 2, kind: 'capacitor', value: '10u', tolerancePct: 5, ratingV: 63, package: 'film' },
			{ designators: 'R1, R2', quantity: 2, kind: 'resistor', value: '100R', tolerancePct: 1, ratingW: 0.25 }
		]
	},
	{
		key: 'dummyload',
		owner: 'reviewer2',
		slug: 'eight-ohm-dummy-load',
		title: '8 Ω 200 W dummy load for bench tests',
		summary: 'Four 33 Ω power resistors in parallel on a large heatsink with a fan, for full-power tests without speakers.',
		category: 'test-gear',
		topology: 'other',
		mainsPowered: false,
		licence: 'CC0-1.0',
		status: 'published',
		cover: { motif: 'heatsink', alt: 'Sketch of power resistors on a finned heatsink' },
		steps: [
			{
				title: 'Resistors on the heatsink',
				body: 'Four 50 W aluminium-clad resistors, 33 Ω each, in parallel give 8.25 Ω. Their rating assumes a heatsink; free-air rating is a fraction of it. The heatsink gets hot enough to burn — it has a guard.',
				image: { motif: 'heatsink', alt: 'Sketch of four resistors on a heatsink' }
			}
		],
		specs: [
			{
				kind: 'thermal',
				data: {
					powerW: 50,
					devices: 4,
					ambientC: 25,
					junctionMaxC: 200,
					rthJcKPerW: 0.5,
					rthCsKPerW: 0.2,
					rthSaKPerW: 0.2,
					tabAtRail: false,
					tabInsulated: false,
					heatsinkBondedToChassis: true
				}
			}
		],
		parts: [
			{ designators: 'R1–R4', quantity: 4, kind: 'resistor', value: '33R', tolerancePct: 5, ratingW: 50, package: 'aluminium clad' },
			{ designators: 'FAN1', quantity: 1, kind: 'other', value: '12 V 80 mm fan' }
		]
	},
	{
		key: 'draft',
		owner: 'maker',
		slug: 'bench-stereo-chip-amp',
		title: 'Bench stereo chip amp, second try',
		summary: 'Work in progress: a smaller case and lower rails for desk speakers.',
		category: 'power-amp',
		topology: 'class-ab-chip',
		mainsPowered: true,
		licence: 'CC-BY-SA-4.0',
		status: 'draft',
		steps: [{ title: 'Plan', body: 'Lower rails (±22 V), smaller heatsinks, same board.' }],
		specs: [],
		parts: []
	}
];

/** Ravi starts his own ±24 V variant (a draft) from the chip amp. */
export const DEMO_DERIVE = { from: 'chipamp', by: 'maker3' as DemoMemberKey, title: 'Chip amp on ±24 V for bookshelf speakers' };

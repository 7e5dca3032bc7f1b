/** The bench tools, in the order the index lists them. */
export type BenchTool = { slug: string; title: string; blurb: string; caution: boolean };

export const BENCH_TOOLS: readonly BenchTool[] = [
	{
		slug: 'amplifier',
		title: 'Amplifier power and dissipation',
		blurb: 'Maximum sine power from the rails and load, peak current, class B worst-case heat and efficiency at a chosen output.',
		caution: true
	},
	{
		slug: 'heatsink',
		title: 'Heatsink and junction temperature',
		blurb: 'Junction temperature through the junction–case–sink chain and the heatsink Rth you need, by insulator kind.',
		caution: true
	},
	{
		slug: 'supply',
		title: 'Supply rails and ripple',
		blurb: 'Unloaded rail from the secondary, ripple, reservoir for a ripple target, capacitor margin at high mains, bleeders.',
		caution: true
	},
	{
		slug: 'gain',
		title: 'Gain, corners and Zobel',
		blurb: 'Non-inverting gain in V/V and dB, input and feedback-leg corners, Zobel pole and resistor heat.',
		caution: false
	},
	{
		slug: 'network',
		title: 'Series and parallel',
		blurb: 'Combine resistors, capacitors or inductors in series or in parallel.',
		caution: false
	},
	{
		slug: 'codes',
		title: 'Component markings and colour bands',
		blurb: 'Decode capacitor, resistor, inductor and potentiometer markings; resistor colour bands both ways.',
		caution: false
	},
	{
		slug: 'eseries',
		title: 'Nearest E-series value',
		blurb: 'Snap a value to E3 … E192 with the neighbours below and above, across decades.',
		caution: false
	}
];

/**
 * The review checklist for mains-powered builds: what a reviewer ticks before signing a build off. Each item
 * names where the practice comes from. Clause numbers are from memory of IEC 62368-1 (audio/video and ICT
 * equipment safety, which replaced IEC 60065) and IEC 60127 (miniature fuses); check them against the
 * edition you use. Where no single standard states it for hobby equipment, the source says
 * "common practice, no single source". None of this replaces local codes or licensed practice.
 *
 * Rule (reviews/verdicts.ts): a mains build is signed off as safe only with every item ticked, or with a
 * note from the reviewer saying why the unticked items do not apply or were not checked. A send-back
 * stores whatever was ticked, with no note needed.
 */

export const CHECKLIST_ITEMS = [
	{
		key: 'pe-continuity',
		label: 'Protective-earth continuity',
		detail: 'Every exposed metal part (chassis, panels, heatsinks outside the case) is bonded to the earth pin of the inlet, with a low-resistance path that does not rely on paint or a hinge.',
		source: 'IEC 62368-1 clause 5.6 (protective conductors), from memory'
	},
	{
		key: 'live-fuse',
		label: 'Fuse in the live conductor, and its rating',
		detail: 'The mains fuse sits in the live (line) conductor before the switch and transformer; its rating and time-lag (T) type suit the transformer’s inrush and primary current.',
		source: 'Fuse-links: IEC 60127 (from memory); placement and sizing: common practice, no single source'
	},
	{
		key: 'mains-insulation',
		label: 'Mains wiring insulated and strain-relieved',
		detail: 'Every mains terminal is shrouded or sleeved, wiring is rated for mains, and the cord or inlet wiring is held so a pull does not load the terminals.',
		source: 'IEC 62368-1 Annex G.7 (mains supply cords and cord anchorage), from memory'
	},
	{
		key: 'creepage-clearance',
		label: 'Creepage and clearance around mains parts',
		detail: 'Mains tracks and terminals keep their distance from low-voltage parts and the chassis, across the board surface (creepage) and through air (clearance).',
		source: 'IEC 62368-1 clauses 5.4.2 (clearances) and 5.4.3 (creepage distances), from memory'
	},
	{
		key: 'reservoir-discharge',
		label: 'Reservoir capacitors discharge',
		detail: 'Large reservoir capacitors bleed down after switch-off (bleeder resistor or load) and the build tells the reader how to check they are discharged before touching.',
		source: 'Common practice, no single source (IEC 62368-1 clause 5.5.2.2 covers capacitors across the mains plug only; from memory)'
	},
	{
		key: 'heatsink-isolation',
		label: 'Heatsink isolation',
		detail: 'Device tabs at a supply rail are insulated from an earthed heatsink (pad or mica and a shoulder washer), checked with a meter before power-up.',
		source: 'Common practice, no single source'
	}
] as const;

export type ChecklistKey = (typeof CHECKLIST_ITEMS)[number]['key'];
export const CHECKLIST_KEYS = CHECKLIST_ITEMS.map((i) => i.key) as unknown as readonly [ChecklistKey, ...ChecklistKey[]];

/** One stored item of a verdict's checklist. */
export interface ChecklistEntry {
	key: string;
	ticked: boolean;
}

/** The stored checklist for the keys a reviewer ticked: every item, in order, ticked or not. */
export function checklistFromTicked(ticked: readonly string[]): ChecklistEntry[] {
	const set = new Set(ticked);
	return CHECKLIST_ITEMS.map((i) => ({ key: i.key, ticked: set.has(i.key) }));
}

/** Label and source of a stored key (a key from an older list keeps its key as label). */
export function checklistItem(key: string): { label: string; source: string } {
	const item = CHECKLIST_ITEMS.find((i) => i.key === key);
	return item ? { label: item.label, source: item.source } : { label: key, source: '' };
}

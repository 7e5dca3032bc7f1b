// Unit tests of the revision compare page's differences (pure): expected results are worked out by hand
// from the two snapshots written out below.
import { describe, expect, it } from 'vitest';
import { diffRevisions, recordChanges, textRuns } from './revision-diff';
import { diffSnapshots, type BuildSnapshot, type SnapshotPart } from './snapshot';

const part = (id: string, over: Partial<SnapshotPart>): SnapshotPart => ({
	id,
	designators: '',
	quantity: 1,
	kind: 'resistor',
	valueText: '',
	value: null,
	unit: null,
	tolerancePct: null,
	ratingV: null,
	ratingW: null,
	package: '',
	notes: '',
	designValueText: null,
	designValue: null,
	substitutionReason: null,
	deviationPct: null,
	...over
});

const A: BuildSnapshot = {
	version: 1,
	build: { title: 'Discrete amp', summary: '', category: 'power-amp', topology: 'class-ab-discrete', mainsPowered: true, licence: 'CC-BY-SA-4.0', coverPhotoId: null },
	steps: [
		{ id: 's1', title: 'Supply', bodyMd: 'Wind the toroid.\nFit a 2 A fuse.\nBond the earth.', bodyHtml: '', photoIds: ['p1'] },
		{ id: 's2', title: 'Output stage', bodyMd: 'Mount the devices.', bodyHtml: '', photoIds: [] }
	],
	specBlocks: [{ id: 'b1', kind: 'supply', title: 'Main', data: { secondaryVac: 22, fuse: { ratingA: 2, type: 'slow' } }, derived: {}, checks: [] }],
	parts: [part('l1', { designators: 'R1', valueText: '0R22', ratingW: 5 }), part('l2', { designators: 'C1', kind: 'capacitor', valueText: '10000u', ratingV: 35 })]
};

const B: BuildSnapshot = {
	...A,
	build: { ...A.build, title: 'Discrete amp, ±30 V' },
	steps: [
		{ id: 's1', title: 'Supply', bodyMd: 'Wind the toroid.\nFit a 1.6 A slow fuse.\nBond the earth.', bodyHtml: '', photoIds: ['p1', 'p2'] },
		{ id: 's2', title: 'Output stage', bodyMd: 'Mount the devices.', bodyHtml: '', photoIds: [] },
		{ id: 's3', title: 'Bring-up', bodyMd: 'Use a bulb tester.', bodyHtml: '', photoIds: [] }
	],
	specBlocks: [{ id: 'b1', kind: 'supply', title: 'Main', data: { secondaryVac: 22, fuse: { ratingA: 1.6, type: 'slow' } }, derived: {}, checks: [] }],
	// C1 saved again under a new id (delete-and-insert) with a higher rating; R1 unchanged; R2 new.
	parts: [part('l1', { designators: 'R1', valueText: '0R22', ratingW: 5 }), part('l9', { designators: 'C1', kind: 'capacitor', valueText: '10000u', ratingV: 50 }), part('l3', { designators: 'R2', valueText: '4k7' })]
};

describe('diffRevisions', () => {
	it('finds the changed title, the changed step line, the new step, the spec value and the parts changes', () => {
		const d = diffRevisions(A, B);
		expect(d.empty).toBe(false);
		expect(d.fields).toEqual([{ name: 'title', before: 'Discrete amp', after: 'Discrete amp, ±30 V' }]);

		expect(d.steps.map((s) => [s.title, s.status])).toEqual([
			['Supply', 'changed'],
			['Output stage', 'same'],
			['Bring-up', 'added']
		]);
		// Only the fuse line differs; the lines around it are kept.
		expect(d.steps[0].text).toEqual([
			{ kind: 'same', text: 'Wind the toroid.\n' },
			{ kind: 'removed', text: 'Fit a 2 A fuse.\n' },
			{ kind: 'added', text: 'Fit a 1.6 A slow fuse.\n' },
			{ kind: 'same', text: 'Bond the earth.\n' }
		]);
		expect(d.steps[0].photos).toEqual({ added: 1, removed: 0 });

		expect(d.specBlocks).toEqual([{ status: 'changed', label: 'supply: Main', fields: [{ name: 'fuse.ratingA', before: '2', after: '1.6' }] }]);

		expect(d.parts.map((p) => [p.label, p.status, p.fields])).toEqual([
			['R1 0R22', 'same', []],
			['C1 10000u', 'changed', [{ name: 'rating V', before: '35', after: '50' }]],
			['R2 4k7', 'added', expect.arrayContaining([{ name: 'value', before: '', after: '4k7' }])]
		]);
	});

	it('lists removed items after the kept ones, and says nothing differs between a snapshot and itself', () => {
		const d = diffRevisions(B, A);
		expect(d.steps.map((s) => s.status)).toEqual(['changed', 'same', 'removed']);
		expect(d.parts.at(-1)).toMatchObject({ label: 'R2 4k7', status: 'removed' });
		expect(diffRevisions(A, A).empty).toBe(true);
	});
});

describe('flags of parts lines and attachments', () => {
	const schematic = { id: 'a1', name: 'schematic-rev2.pdf', kind: 'schematic' };
	const gerbers = { id: 'a2', name: 'board-gerbers.zip', kind: 'pcb' };
	const before: BuildSnapshot = {
		...A,
		parts: [
			part('l1', { designators: 'R1', valueText: '0R22', ratingW: 5 }),
			part('l4', { designators: 'CX1', kind: 'capacitor', valueText: '100n', ratingV: 275, ratingVAc: false })
		],
		attachments: [schematic]
	};
	const after: BuildSnapshot = {
		...A,
		parts: [
			part('l1', { designators: 'R1', valueText: '0R22', ratingW: 5, perChannel: true }),
			part('l4', { designators: 'CX1', kind: 'capacitor', valueText: '100n', ratingV: 275, ratingVAc: true })
		],
		attachments: [gerbers]
	};

	it('lists a per-channel flag and an AC rating that changed, as yes/no', () => {
		const d = diffRevisions(before, after);
		expect(d.parts.map((p) => [p.label, p.status, p.fields])).toEqual([
			['R1 0R22', 'changed', [{ name: 'per channel', before: 'no', after: 'yes' }]],
			['CX1 100n', 'changed', [{ name: 'voltage rating is AC', before: 'no', after: 'yes' }]]
		]);
		// The revision summary counts the same two lines.
		expect(diffSnapshots(before, after)).toContain('parts: 2 changed');
	});

	it('lists attachments added and removed by name and kind (matched by id), and counts them as a difference', () => {
		const d = diffRevisions(before, after);
		expect(d.attachments).toEqual([
			{ status: 'added', name: 'board-gerbers.zip', kind: 'pcb' },
			{ status: 'removed', name: 'schematic-rev2.pdf', kind: 'schematic' }
		]);
		const onlyFiles = diffRevisions(before, { ...before, attachments: [schematic, gerbers] });
		expect(onlyFiles.empty).toBe(false);
		expect(onlyFiles.attachments).toEqual([{ status: 'added', name: 'board-gerbers.zip', kind: 'pcb' }]);
	});

	it('reads a snapshot from before the flags and attachments existed as "no" and none: nothing differs', () => {
		// Older snapshots have no ratingVAc/perChannel keys and no attachments list.
		const old: BuildSnapshot = { ...A, attachments: undefined };
		const now: BuildSnapshot = { ...A, parts: A.parts.map((p) => ({ ...p, ratingVAc: false, perChannel: false, mpn: '', supplier: '', unitPrice: null, currency: null })), attachments: [] };
		expect(diffRevisions(old, now).empty).toBe(true);
		expect(diffSnapshots(old, now)).toEqual([]);
		// An added line lists the fields it has, not its unset flags.
		const added = diffRevisions(A, { ...A, parts: [...A.parts, part('l5', { designators: 'R5', valueText: '1k', perChannel: false })] }).parts.at(-1)!;
		expect(added.fields.map((f) => f.name)).toEqual(['designators', 'quantity', 'kind', 'value']);
	});
});

describe('helpers', () => {
	it('textRuns is empty for equal texts and treats a missing last newline as none', () => {
		expect(textRuns('a\nb', 'a\nb')).toEqual([]);
		expect(textRuns('a', 'a\nb')).toEqual([
			{ kind: 'same', text: 'a\n' },
			{ kind: 'added', text: 'b\n' }
		]);
	});

	it('recordChanges flattens nested values and shows added and removed fields', () => {
		expect(recordChanges({ a: 1, n: { x: true } }, { a: 1, n: { x: false }, b: 'new' })).toEqual([
			{ name: 'n.x', before: 'true', after: 'false' },
			{ name: 'b', before: '', after: 'new' }
		]);
	});
});

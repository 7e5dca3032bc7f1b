import { describe, it, expect } from 'vitest';
import { pairSpecBlocks } from './spec-pairs';
import { amplifierBlock, supplyBlock } from '$lib/specs/fixtures';

const blk = (kind: string, data: Record<string, unknown>, derived: Record<string, unknown> = {}, checks: { level: string }[] = []) => ({ kind, data, derived, checks });

describe('pairSpecBlocks', () => {
	it('pairs blocks by kind in order, amplifier before supply, and marks what differs', () => {
		const pairs = pairSpecBlocks(
			[blk('supply', supplyBlock()), blk('amplifier', amplifierBlock({ railV: 28 }), { maxPowerW: 40.5 }, [{ level: 'caution' }])],
			[blk('amplifier', amplifierBlock({ railV: 35 }), { maxPowerW: 64 })]
		);
		expect(pairs.map((p) => [p.kind, p.left, p.right])).toEqual([
			['amplifier', true, true],
			['supply', true, false]
		]);
		const rail = pairs[0].inputs.find((r) => r.key === 'railV')!;
		expect(rail).toMatchObject({ left: '28 V', right: '35 V', differs: true });
		expect(pairs[0].inputs.find((r) => r.key === 'loadOhm')).toMatchObject({ differs: false });
		expect(pairs[0].derived).toEqual([expect.objectContaining({ key: 'maxPowerW', left: '40.5 W', right: '64 W', differs: true })]);
		expect(pairs[0].signs).toEqual({ left: { danger: 0, caution: 1 }, right: { danger: 0, caution: 0 } });
		// A block only one build has: every field shows a dash on the other side and counts as differing.
		expect(pairs[1].inputs.every((r) => r.right === '—' && r.differs)).toBe(true);
	});

	it('numbers the second block of a kind and shows ohms with an engineering prefix', () => {
		const pairs = pairSpecBlocks(
			[blk('amplifier', { loadOhm: 8 }), blk('amplifier', { loadOhm: 4700 })],
			[blk('amplifier', { loadOhm: 8 })]
		);
		expect(pairs.map((p) => p.nth)).toEqual([1, 2]);
		expect(pairs[1].inputs[0]).toMatchObject({ left: '4.7 kΩ', right: '—' });
		expect(pairSpecBlocks([], [])).toEqual([]);
	});
});

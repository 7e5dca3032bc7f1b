import { describe, expect, it } from 'vitest';
import { ToolParams } from './params';
import { MAX_PARTS, partsAfterEdit } from './network-form';

// The bench tools' GET forms: what the address carries becomes the fields' text exactly as typed.
// Expected values are the WHATWG URL standard's application/x-www-form-urlencoded decoding (what a
// browser's GET form sends), worked out by hand here.
describe('ToolParams', () => {
	it('reads a field as typed, the default only when the address lacks it', () => {
		const p = new ToolParams(new URLSearchParams('railV=28&loadOhm=4%CE%A97&outputW='));
		expect(p.text('railV', '35')).toBe('28');
		expect(p.text('loadOhm', '8')).toBe('4Ω7'); // percent-encoded UTF-8 decoded
		expect(p.text('outputW', '20')).toBe(''); // emptied on purpose: stays empty
		expect(p.text('dropoutV', '3')).toBe('3');
	});

	it('keeps any text, NUL and spaces included (the field reads it and answers a sentence)', () => {
		const p = new ToolParams(new URLSearchParams('code=%00+4k7%20'));
		expect(p.text('code', '474K')).toBe('\u0000 4k7 ');
	});

	it('takes a choice only from its options', () => {
		const p = new ToolParams(new URLSearchParams('supply=single&series=E7&mainsHz=60%00'));
		expect(p.choice('supply', ['split', 'single'], 'split')).toBe('single');
		expect(p.choice('series', ['E12', 'E24'], 'E12')).toBe('E12');
		expect(p.choice('mainsHz', ['50', '60'], '50')).toBe('50');
		expect(p.choice('absent', ['a', 'b'], 'b')).toBe('b');
	});

	it('reads a repeated field in order', () => {
		const p = new ToolParams(new URLSearchParams('value=10k&value=&value=4k7'));
		expect(p.all('value', ['1'])).toEqual(['10k', '', '4k7']);
		expect(p.all('other', ['4k7', '4k7'])).toEqual(['4k7', '4k7']);
	});
});

describe('partsAfterEdit (series/parallel add and remove buttons)', () => {
	it('leaves an address without a button alone', () => {
		expect(partsAfterEdit(new URLSearchParams('value=1k&value=2k'))).toBeNull();
	});

	it('adds an empty part and drops the button', () => {
		expect(String(partsAfterEdit(new URLSearchParams('part=capacitor&value=1u&value=2u2&add=1')))).toBe('part=capacitor&value=1u&value=2u2&value=');
	});

	it('removes the part at the index, keeping the other fields', () => {
		expect(String(partsAfterEdit(new URLSearchParams('value=1k&value=2k&value=3k&arrangement=series&remove=1')))).toBe(
			'arrangement=series&value=1k&value=3k'
		);
	});

	it('never removes the last part, ignores a nonsense index and stops adding at the limit', () => {
		expect(String(partsAfterEdit(new URLSearchParams('value=1k&remove=0')))).toBe('value=1k');
		expect(String(partsAfterEdit(new URLSearchParams('value=1k&value=2k&remove=x')))).toBe('value=1k&value=2k');
		const full = new URLSearchParams(Array.from({ length: MAX_PARTS + 3 }, () => ['value', '1k']));
		full.append('add', '1');
		expect(partsAfterEdit(full)?.getAll('value')).toHaveLength(MAX_PARTS);
	});
});

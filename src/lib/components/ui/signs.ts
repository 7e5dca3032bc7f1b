/**
 * Check levels shown as safety signs after the open sign standards: the signal words and their
 * conventional colours of ANSI Z535.4 / ISO 3864-2 (DANGER white on safety red, CAUTION black on safety
 * yellow, NOTICE white on safety blue). The API keeps its own level names (`danger`, `caution`, `note`).
 * DANGER and CAUTION carry the safety alert symbol (a triangle with an exclamation mark, ISO 7010 W001);
 * NOTICE does not, as it concerns property and practice rather than injury (ANSI Z535.4, from memory).
 */
export type SignLevel = 'danger' | 'caution' | 'note';

/** The signal word for a check level: 'danger' → "DANGER", 'note' → "NOTICE"; unknown levels read as NOTICE. */
export function signalWord(level: string): 'DANGER' | 'CAUTION' | 'NOTICE' {
	return level === 'danger' ? 'DANGER' : level === 'caution' ? 'CAUTION' : 'NOTICE';
}

/** A stored level narrowed to one of the three sign levels (unknown → 'note'). */
export function signLevel(level: string): SignLevel {
	return level === 'danger' || level === 'caution' ? level : 'note';
}

/** Counts in words, most serious first, leaving out zeros: { danger: 1, caution: 2, note: 0 } → "1 DANGER · 2 CAUTION". */
export function signCounts(c: { danger: number; caution: number; note: number }): string {
	return (
		[
			[c.danger, 'DANGER'],
			[c.caution, 'CAUTION'],
			[c.note, 'NOTICE']
		] as const
	)
		.filter(([n]) => n > 0)
		.map(([n, w]) => `${n} ${w}`)
		.join(' · ');
}

/**
 * Revisions are lettered the way engineering drawings carry them: Rev A, Rev B, … Z, then AA, AB, …
 * The letters I, O, Q, S, X and Z are skipped because they read as digits or other marks
 * (ASME Y14.35, revision of engineering drawings; from memory). Revision numbers start at 1.
 * 1 → "A", 8 → "H", 9 → "J" (I skipped), 20 → "Y", 21 → "AA".
 */
const LETTERS = 'ABCDEFGHJKLMNPRTUVWY';

/** The revision letter(s) for revision number n ≥ 1 ("A", "B", …, "Y", "AA", …). */
export function revisionLetter(n: number): string {
	if (!Number.isInteger(n) || n < 1) throw new RangeError('revision numbers start at 1');
	let out = '';
	let k = n;
	while (k > 0) {
		k -= 1;
		out = LETTERS[k % LETTERS.length] + out;
		k = Math.floor(k / LETTERS.length);
	}
	return out;
}

/** "Rev B" for revision 2. */
export function revisionLabel(n: number): string {
	return `Rev ${revisionLetter(n)}`;
}

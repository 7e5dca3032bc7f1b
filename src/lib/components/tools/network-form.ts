/**
 * The series/parallel tool's list of parts as a GET form: every part is a repeated `value` field, and the
 * "Add a part" and "Remove part n" buttons send `add=1` or `remove=<index>` with the fields. The server
 * answers such a request with a redirect to the list after the change (so the address never carries the
 * button, and reloading it does not add or remove again).
 */
export const MAX_PARTS = 50;

/**
 * The address after an add or remove button, or null when `params` carries neither.
 * `partsAfterEdit(new URLSearchParams('value=1k&value=2k&remove=0'))` → `value=2k`.
 */
export function partsAfterEdit(params: URLSearchParams): URLSearchParams | null {
	const add = params.has('add');
	const remove = params.get('remove');
	if (!add && remove === null) return null;
	const values = params.getAll('value').slice(0, MAX_PARTS);
	const next = new URLSearchParams();
	for (const [name, v] of params) if (name !== 'value' && name !== 'add' && name !== 'remove') next.append(name, v);
	let kept = values;
	if (remove !== null && /^\d+$/.test(remove) && values.length > 1) kept = values.filter((_, i) => i !== Number(remove));
	if (add && kept.length < MAX_PARTS) kept = [...kept, ''];
	for (const v of kept) next.append('value', v);
	return next;
}

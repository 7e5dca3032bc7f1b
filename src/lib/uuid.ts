/** Any 8-4-4-4-12 hex id, case-insensitive (looser than RFC 9562's version bits, like PostgreSQL's uuid type). */
export const UUID_PATTERN = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/** True for a well-formed UUID: check before a value reaches a uuid column, which would throw on anything else. */
export function isUuid(value: unknown): value is string {
	return typeof value === 'string' && UUID_PATTERN.test(value);
}

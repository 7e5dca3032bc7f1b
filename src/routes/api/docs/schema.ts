/** Plain-words summaries of JSON Schema fragments for the API docs page (pure). */
export type Schema = {
	type?: string | string[];
	enum?: unknown[];
	const?: unknown;
	default?: unknown;
	minimum?: number;
	maximum?: number;
	exclusiveMinimum?: number;
	exclusiveMaximum?: number;
	minLength?: number;
	maxLength?: number;
	minItems?: number;
	maxItems?: number;
	pattern?: string;
	format?: string;
	description?: string;
	properties?: Record<string, Schema>;
	required?: string[];
	items?: Schema;
	anyOf?: Schema[];
	oneOf?: Schema[];
	additionalProperties?: Schema | boolean;
	$ref?: string;
};

/** The type of a schema in a few words: 'number', 'list of string', 'one of: split, single', 'object'. */
export function typeText(s: Schema): string {
	if (s.const !== undefined) return `exactly ${JSON.stringify(s.const)}`;
	if (s.enum) return `one of: ${s.enum.map((v) => String(v)).join(', ')}`;
	if (s.anyOf || s.oneOf) return 'one of the shapes below';
	if (s.$ref) return s.$ref.split('/').pop() ?? 'object';
	const t = Array.isArray(s.type) ? s.type.join(' or ') : s.type;
	if (t === 'array') return `list of ${s.items ? typeText(s.items) : 'values'}`;
	if (t === 'object' && !s.properties && s.additionalProperties) return 'object (free keys)';
	return [t ?? 'any', s.format].filter(Boolean).join(', ');
}

/** Limits of a schema in a few words: '> 0 · ≤ 200', 'up to 200 characters', 'default 4'. */
export function limitsText(s: Schema): string {
	const parts: string[] = [];
	if (s.exclusiveMinimum !== undefined) parts.push(`> ${s.exclusiveMinimum}`);
	if (s.minimum !== undefined) parts.push(`≥ ${s.minimum}`);
	if (s.exclusiveMaximum !== undefined) parts.push(`< ${s.exclusiveMaximum}`);
	if (s.maximum !== undefined) parts.push(`≤ ${s.maximum}`);
	if (s.minLength !== undefined && s.minLength > 0) parts.push(`at least ${s.minLength} characters`);
	if (s.maxLength !== undefined) parts.push(`up to ${s.maxLength} characters`);
	if (s.minItems !== undefined) parts.push(`at least ${s.minItems} items`);
	if (s.maxItems !== undefined) parts.push(`at most ${s.maxItems} items`);
	if (s.pattern) parts.push(`matches ${s.pattern}`);
	if (s.default !== undefined) parts.push(`default ${JSON.stringify(s.default)}`);
	return parts.join(' · ');
}

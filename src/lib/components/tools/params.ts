/**
 * A bench tool's inputs as they arrive in its address: the tools are GET forms computed on the server
 * (`/tools/amplifier?railV=28&loadOhm=4`), so a result can be shared, bookmarked and used without
 * JavaScript. Every field is read as the text the maker typed (never trimmed or changed here: the
 * field shows it back exactly); a choice that is not one of its options falls back to the default.
 * Nothing here computes an engineering result.
 */
export class ToolParams {
	readonly #params: URLSearchParams;

	constructor(params: URLSearchParams) {
		this.#params = params;
	}

	/** The text of field `name`, or `fallback` when the address does not carry it (a first visit). */
	text(name: string, fallback: string): string {
		return this.#params.get(name) ?? fallback;
	}

	/** The choice of select `name` when it is one of `options`, else `fallback`. */
	choice<T extends string>(name: string, options: readonly T[], fallback: T): T {
		const v = this.#params.get(name);
		return v !== null && (options as readonly string[]).includes(v) ? (v as T) : fallback;
	}

	/** Every value of a repeated field (`value=4k7&value=10k`), or `fallback` when there is none. */
	all(name: string, fallback: readonly string[]): string[] {
		const v = this.#params.getAll(name);
		return v.length ? v : [...fallback];
	}
}

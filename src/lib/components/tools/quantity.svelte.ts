/** A bench-tool input field's state: the text as typed, and what it reads as (live, via $derived). */
import { readQuantity, type QuantitySpec, type Reading } from './quantity';

export class Quantity {
	/** The text in the input, exactly as typed. */
	text = $state('');
	readonly #spec: QuantitySpec | (() => QuantitySpec);
	/** Empty text is allowed and reads as "not given" (value undefined, no error). */
	readonly optional: boolean;

	/** `spec` may be a function so a field can change kind with the page's state (it is read reactively). */
	constructor(initial: string, spec: QuantitySpec | (() => QuantitySpec), optional = false) {
		this.text = initial;
		this.#spec = spec;
		this.optional = optional;
	}

	/** How the text is read. */
	get spec(): QuantitySpec {
		return typeof this.#spec === 'function' ? this.#spec() : this.#spec;
	}

	/** What the text reads as; for an optional, empty field: ok with no value. */
	readonly reading: Reading | { ok: true; value: undefined } = $derived.by(() =>
		this.optional && this.text.trim() === '' ? { ok: true, value: undefined } : readQuantity(this.text, this.spec)
	);

	/** The number in SI units, or undefined when empty or unreadable. */
	get value(): number | undefined {
		return this.reading.ok ? this.reading.value : undefined;
	}

	/** The sentence to show under the field when the text cannot be read. */
	get error(): string | undefined {
		return this.reading.ok ? undefined : this.reading.error;
	}
}

/** The two widths the workshop's end-to-end tests run at: a desktop window and a 390×844 phone. */
export const SIZES = [
	{ name: 'desktop', viewport: { width: 1280, height: 900 } },
	{ name: 'phone', viewport: { width: 390, height: 844 } }
] as const;

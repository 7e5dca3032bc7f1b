/**
 * Password rules: 12 to 128 characters (OWASP ASVS 4.0.3, V2.1.1 and V2.1.2) and not a common or
 * easily guessed password, judged by zxcvbn-ts with its common-language dictionary (shipped as data in
 * the package; nothing is fetched at run time). A score below 3 ("safely unguessable: moderate
 * protection from offline slow-hash scenario", zxcvbn's own scale) is refused.
 */
import * as corePkg from '@zxcvbn-ts/core';
import * as commonPkg from '@zxcvbn-ts/language-common';

export const PASSWORD_MIN = 12;
export const PASSWORD_MAX = 128;
export const PASSWORD_MIN_SCORE = 3;

// Both packages are CommonJS: Node hands them over as `default`, a bundler as named exports.
const core = ((corePkg as { default?: typeof corePkg }).default ?? corePkg) as typeof corePkg;
const common = ((commonPkg as { default?: typeof commonPkg }).default ?? commonPkg) as typeof commonPkg;

let factory: InstanceType<typeof core.ZxcvbnFactory> | null = null;
function zxcvbn() {
	factory ??= new core.ZxcvbnFactory({ dictionary: { ...common.dictionary }, graphs: common.adjacencyGraphs });
	return factory;
}

/**
 * The sentence telling why `password` is refused, or null when it is acceptable. `userInputs` (name,
 * handle, e-mail) count as guessable words too.
 */
export function passwordProblem(password: string, userInputs: string[] = []): string | null {
	if (password.length < PASSWORD_MIN) return `Use at least ${PASSWORD_MIN} characters.`;
	if (password.length > PASSWORD_MAX) return `Use at most ${PASSWORD_MAX} characters.`;
	const inputs = userInputs.flatMap((s) => s.toLowerCase().split(/[@.\s_-]+/)).filter((s) => s.length >= 3);
	const result = zxcvbn().check(password, inputs);
	if (result.score >= PASSWORD_MIN_SCORE) return null;
	return 'This password is too easy to guess (it is common, or close to your name or address). Add a few unrelated words.';
}

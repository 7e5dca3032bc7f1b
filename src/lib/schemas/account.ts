import { z } from 'zod';

export const email = z.string().trim().toLowerCase().email('Enter a valid e-mail address.').max(254);
/** 12 to 128 characters (OWASP ASVS 4.0.3 V2.1.1/V2.1.2); the server also refuses easily guessed ones. */
export const password = z
	.string()
	.min(12, 'Use at least 12 characters.')
	.max(128, 'Use at most 128 characters.');

/** The name others see; no control characters. */
export const displayName = z
	.string()
	.trim()
	.min(1, 'Enter the name others will see.')
	.max(80, 'Use at most 80 characters.')
	.regex(/^[^\p{Cc}]*$/u, 'Leave out control characters.');

export const handle = z
	.string()
	.trim()
	.toLowerCase()
	.min(3, 'Use at least 3 characters.')
	.max(24, 'Use at most 24 characters.')
	.regex(/^[a-z0-9][a-z0-9-]*$/, 'Letters, digits and dashes; start with a letter or digit.');

export const signUpSchema = z.object({
	name: displayName,
	handle,
	email,
	password
});

export const signInSchema = z.object({
	email,
	password: z.string().min(1, 'Enter your password.').max(128)
});

export const forgotSchema = z.object({ email });

export const resendSchema = z.object({ email });

export const resetSchema = z
	.object({
		token: z.string().min(1),
		password,
		confirm: z.string()
	})
	.refine((v) => v.password === v.confirm, { message: 'The two passwords differ.', path: ['confirm'] });

export const profileSchema = z.object({
	name: z.string().trim().min(1, 'Enter the name others will see.').max(80),
	bio: z.string().trim().max(600, 'Keep the bio under 600 characters.').default(''),
	notifyReview: z.boolean().default(true),
	notifyFlag: z.boolean().default(true),
	notifyReply: z.boolean().default(true),
	notifyComment: z.boolean().default(true),
	notifyRevision: z.boolean().default(true)
});

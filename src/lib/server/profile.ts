/** A member's own profile settings: display name, bio and which notification mails they get. */
import { eq } from 'drizzle-orm';
import { error } from '@sveltejs/kit';
import { db } from './db';
import * as schema from './db/schema';
import { profileSchema } from '$lib/schemas/account';
import type { z } from 'zod';

export type ProfileSettings = z.infer<typeof profileSchema>;

/** The member's editable settings and the read-only facts shown next to them. */
export async function getProfileSettings(userId: string) {
	const [u] = await db.select().from(schema.user).where(eq(schema.user.id, userId));
	if (!u) error(404, 'Not found');
	return {
		form: { name: u.name, bio: u.bio, notifyReview: u.notifyReview, notifyFlag: u.notifyFlag, notifyReply: u.notifyReply } satisfies ProfileSettings,
		account: { email: u.email, handle: u.handle, role: u.role, createdAt: u.createdAt }
	};
}

/** Save the member's settings (validated again here: the one place that writes them). */
export async function saveProfileSettings(userId: string, input: ProfileSettings): Promise<void> {
	const data = profileSchema.parse(input);
	await db
		.update(schema.user)
		.set({ name: data.name, bio: data.bio, notifyReview: data.notifyReview, notifyFlag: data.notifyFlag, notifyReply: data.notifyReply })
		.where(eq(schema.user.id, userId));
}

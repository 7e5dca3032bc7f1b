import { error, redirect } from '@sveltejs/kit';
import { CATEGORIES } from '$lib/schemas/build';
import type { PageServerLoad } from './$types';

/** /categories/:category is the browse page with that filter. */
export const load: PageServerLoad = ({ params }) => {
	if (!(CATEGORIES as readonly string[]).includes(params.category)) error(404, 'Not found');
	redirect(308, `/builds?category=${params.category}`);
};

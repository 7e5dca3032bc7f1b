// The site header's menus are <details> disclosures: they open, close and hold their links without any
// script. This small file (loaded as is, no framework, on every page) adds what a menu is expected to do
// besides: Escape closes the open menu and gives the focus back to its summary, a click outside a menu or
// on one of its links closes it, and opening one menu closes the other. Listeners sit on the document, so
// they keep working when a hydrated page swaps its content.
(() => {
	const menus = () => document.querySelectorAll('[data-site-header] details');
	document.addEventListener('keydown', (e) => {
		if (e.key !== 'Escape') return;
		for (const m of menus()) {
			if (!m.open) continue;
			m.open = false;
			m.querySelector('summary')?.focus();
		}
	});
	document.addEventListener('click', (e) => {
		const target = e.target instanceof Element ? e.target : null;
		for (const m of menus()) if (m.open && (!target || !m.contains(target) || target.closest('a'))) m.open = false;
	});
	document.addEventListener(
		'toggle',
		(e) => {
			const opened = e.target;
			if (!(opened instanceof HTMLDetailsElement) || !opened.open || !opened.closest('[data-site-header]')) return;
			for (const m of menus()) if (m !== opened) m.open = false;
		},
		true
	);
})();

// Live results for the bench tools, without the framework. The tools are GET forms computed on the server
// (results in the address, working without JavaScript); this script, served as /tools/live.js after
// morphdom (src/lib/server/tools-live.ts), asks the server for the same page as the maker types and morphs
// the difference into the page: results, plots, field errors and fields that come and go. The field being
// typed into is never replaced (its text, focus and caret stay); the address follows the inputs, so it can
// be shared at any moment. Plain browser JavaScript, served as written (no build step).
(function () {
	/** @type {(from: Element, to: Element, options: object) => void} */
	const morph = /** @type {any} */ (window).morphdom;
	const root = document.querySelector('[data-live-root]');
	const form = root && root.querySelector('form[data-live-form]');
	if (!root || !form || typeof morph !== 'function' || !window.fetch || !window.DOMParser) return;
	document.documentElement.classList.add('tools-live');

	let sent = 0;
	let shown = 0;
	/** @type {ReturnType<typeof setTimeout> | undefined} */
	let timer;

	/**
	 * The form's fields (and the pressed button's name and value) as a query string.
	 * @param {HTMLFormElement} f
	 * @param {HTMLElement | null} submitter
	 */
	function query(f, submitter) {
		const params = new URLSearchParams();
		for (const [name, value] of new FormData(f, /** @type {any} */ (submitter))) if (typeof value === 'string') params.append(name, value);
		return params.toString();
	}

	/**
	 * Fetch the page for the form's current fields and morph it in. While typing (`keep`), every field keeps
	 * what it holds now; after a button (add or remove a part) the server's fields win.
	 * @param {HTMLElement | null} submitter
	 * @param {boolean} keep
	 */
	async function update(submitter, keep) {
		const current = /** @type {HTMLFormElement | null} */ (root && root.querySelector('form[data-live-form]'));
		if (!current || !root) return;
		const id = ++sent;
		const qs = query(current, submitter);
		let res;
		let html;
		try {
			res = await fetch(location.pathname + (qs ? '?' + qs : ''), { headers: { accept: 'text/html' }, credentials: 'same-origin' });
			html = await res.text();
		} catch {
			res = null; // offline or the server away
		}
		if (id <= shown) return; // an answer overtaken by a later one
		if (!res || !res.ok || html === undefined) {
			// What is shown stays, marked as being for earlier inputs (the next good answer replaces the mark).
			const note = root.querySelector('[data-live-offline]');
			if (note instanceof HTMLElement) note.hidden = false;
			return;
		}
		const next = new DOMParser().parseFromString(html, 'text/html').querySelector('[data-live-root]');
		if (!next) return;
		shown = id;
		morph(root, next, {
			/** @param {Element} from @param {Element} to */
			onBeforeElUpdated(from, to) {
				if (!keep) return true;
				if (from instanceof HTMLInputElement || from instanceof HTMLTextAreaElement) {
					/** @type {HTMLInputElement} */ (to).value = from.value;
				} else if (from instanceof HTMLSelectElement) {
					const options = Array.from(to.querySelectorAll('option'));
					if (options.some((o) => o.value === from.value))
						for (const o of options) o.value === from.value ? o.setAttribute('selected', '') : o.removeAttribute('selected');
				}
				return true;
			}
		});
		const url = new URL(res.url);
		if (url.origin === location.origin) history.replaceState(history.state, '', url.pathname + url.search + location.hash);
		const focus = submitter && submitter.getAttribute('data-focus-after');
		if (focus) /** @type {HTMLElement | null} */ (root.querySelector(focus))?.focus();
	}

	root.addEventListener('input', (e) => {
		if (!(e.target instanceof Element) || !e.target.closest('form[data-live-form]')) return;
		clearTimeout(timer);
		timer = setTimeout(() => update(null, true), 150);
	});
	root.addEventListener('change', (e) => {
		if (!(e.target instanceof HTMLSelectElement)) return;
		clearTimeout(timer);
		update(null, true);
	});
	root.addEventListener('submit', (e) => {
		if (!(e.target instanceof HTMLFormElement) || !e.target.matches('form[data-live-form]')) return;
		e.preventDefault();
		clearTimeout(timer);
		const submitter = /** @type {SubmitEvent} */ (e).submitter;
		update(submitter instanceof HTMLElement ? submitter : null, !(submitter && submitter.getAttribute('name')));
	});
})();

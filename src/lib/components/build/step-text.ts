/**
 * How step text (sanitized HTML from the server's one Markdown pipeline) is shown everywhere: the build
 * page, a revision, the editor's preview. Inline code keeps its own look without the typography plugin's
 * added backticks; block quotes are plain indented text with a rule, without added quotation marks;
 * placed photos fit the column.
 */
export const STEP_TEXT_CLASS = [
	'prose prose-sm max-w-none prose-a:text-copper-dark',
	'prose-code:font-mono prose-code:font-normal prose-code:rounded prose-code:bg-paper-deep prose-code:px-1 prose-code:py-0.5',
	'prose-code:before:content-none prose-code:after:content-none',
	'prose-pre:bg-ink prose-pre:text-paper [&_pre_code]:bg-transparent [&_pre_code]:p-0',
	'prose-blockquote:border-l-copper/60 prose-blockquote:font-normal prose-blockquote:not-italic prose-blockquote:text-ink-soft',
	'[&_blockquote_p]:before:content-none [&_blockquote_p]:after:content-none',
	'[&_img.placed-photo]:my-3 [&_img.placed-photo]:h-auto [&_img.placed-photo]:max-w-full [&_img.placed-photo]:rounded-md [&_img.placed-photo]:border [&_img.placed-photo]:border-paper-line',
	'[&_.photo-missing]:rounded [&_.photo-missing]:bg-amber-50 [&_.photo-missing]:px-1 [&_.photo-missing]:text-level-caution'
].join(' ');

/** The code that places a photo in step text: `[[photo:` + the first 8 characters of its id + `]]`. */
export const photoRefFor = (photoId: string) => `[[photo:${photoId.slice(0, 8).toLowerCase()}]]`;

/** True when step HTML shows the photo with id `photoId` placed in its text (the gallery then leaves it out). */
export const placesPhoto = (html: string, photoId: string) => html.includes(`/media/photos/${photoId}/`);

/** Comment shapes shared by the API, the server module and the Comments component. */

/** A comment as the API and the Comments component show it. */
export interface CommentItem {
	id: string;
	author: { name: string; handle: string | null } | null;
	bodyHtml: string;
	createdAt: string;
	editedAt: string | null;
	parentId: string | null;
	replies: CommentItem[];
	/** Only for moderators: the comment is hidden from readers. */
	hidden?: true;
	hiddenReason?: string | null;
	/** Deleted by its author; kept as a placeholder because it has replies. */
	deleted?: true;
	/** The viewer wrote it. */
	mine?: true;
	/** The Markdown source, only for the viewer's own comments (to edit them). */
	bodyMd?: string;
	/** Until when the viewer may edit it (ISO), when it is theirs and still editable. */
	editableUntil?: string;
}

/** How long an author may edit a comment after posting it (ms). */
export const EDIT_WINDOW_MS = 15 * 60 * 1000;

/**
 * A comment form the server refused (the build page's form actions): which form (`post` a comment, `reply` to
 * comment `id`, `edit` / `delete` / `report` comment `id`), the text the member sent, and the sentence.
 */
export interface CommentFailure {
	kind: 'post' | 'reply' | 'edit' | 'delete' | 'report';
	id: string | null;
	text: string;
	error: string;
}

// Read the fake SMTP inbox (fakes/smtp.js) from end-to-end tests.
export interface InboxMessage {
	id: string;
	to: string[];
	subject: string;
	text: string;
	html: string;
	headers: Record<string, string>;
	/** Every header as sent, lower-case names. */
	rawHeaders: Record<string, string>;
}

const viewer = () => process.env.MAIL_VIEWER_URL ?? 'http://127.0.0.1:2590';

/** Wait until a message to `to` whose subject matches arrives; returns it. */
export async function waitForMail(to: string, subject: RegExp, timeoutMs = 20_000): Promise<InboxMessage> {
	const until = Date.now() + timeoutMs;
	while (Date.now() < until) {
		const res = await fetch(`${viewer()}/messages?to=${encodeURIComponent(to)}`);
		const list = (await res.json()) as InboxMessage[];
		const hit = list.find((m) => subject.test(m.subject));
		if (hit) return hit;
		await new Promise((r) => setTimeout(r, 250));
	}
	throw new Error(`no mail to ${to} matching ${subject} within ${timeoutMs} ms`);
}

/** The first http(s) link in a message's text part that contains `part`. */
export function linkIn(msg: InboxMessage, part: string): string {
	const link = msg.text.match(/https?:\/\/\S+/g)?.find((l) => l.includes(part));
	if (!link) throw new Error(`no link containing ${part} in "${msg.subject}"`);
	return link;
}

import { describe, expect, it } from 'vitest';
import { demoMails, demoRunSheet, demoScheduleChange } from '../../emails/demo';
import { renderRunSheet, warningText } from '../../emails/run-sheet';
import { renderInvitation } from '../../emails/invitation';
import { renderScheduleChange } from '../../emails/schedule-change';
import { renderSignInLink } from '../../emails/sign-in-link';

const origin = 'https://gloaming.example';

describe('run sheet e-mail', () => {
	const d = demoRunSheet('Hollow Pines Trail', origin);
	const { subject, html, text } = renderRunSheet(d);

	it('carries the night, the post and every section in both parts', () => {
		expect(subject).toBe('Run sheet for Saturday 31 October 2026 at Hollow Pines Trail');
		for (const part of [html, text]) {
			for (const s of [
				'17:30',
				'19:00',
				'Room tech, Crow Loft',
				'14 Lantern Lane, Ashcombe',
				'Feathers fall',
				'pulse the drop valve',
				'Fog fluid above the line',
				'Ide Brannock',
				'Show stop',
				'stop button'
			])
				expect(part).toContain(s);
		}
	});

	it('flags strobe, fog, pneumatics and stood-down props', () => {
		expect(warningText({ kind: 'strobe', note: '4 flashes per second' })).toMatch(/^Strobe/);
		expect(warningText({ kind: 'stood_down', prop: 'Plate', reason: 'cracked' })).toBe(
			'Stood down tonight: Plate, held in safe state (cracked)'
		);
		expect(warningText({ kind: 'mains' })).toMatch(/^Mains-powered load/);
		expect(text).toContain('! Fog');
		expect(text).toContain('! Pneumatics');
		expect(text).toContain('! Stood down tonight: Root hand plate');
		expect(html).toContain('Stood down tonight: Root hand plate');
	});

	it('escapes what people typed and keeps to inline styles and tables', () => {
		const evil = renderRunSheet({ ...d, person: { name: '<script>x</script>' } });
		expect(evil.html).not.toContain('<script>');
		expect(evil.html).toContain('&lt;script>x&lt;/script>');
		expect(html).not.toMatch(/<style|<link|class=/);
		expect(html).toContain('<table');
	});

	it('says so when a crew member has no scenes or checks', () => {
		const empty = renderRunSheet({ ...d, scenes: [], checklist: [], safetyContacts: [] });
		expect(empty.text).toContain('No scenes run in your rooms tonight.');
		expect(empty.text).toContain('No checks assigned to you.');
		// Before the show's checklist exists, the section is left out rather than claiming none.
		const noList = renderRunSheet({ ...d, checklist: undefined });
		expect(noList.text).not.toContain('Your checks before doors');
		expect(noList.html).not.toContain('Your checks before doors');
	});

	it('a changed run sheet says what changed, in the subject and both parts', () => {
		const changed = renderRunSheet({
			...d,
			changes: [{ what: 'Crew call', before: '17:30', after: '17:00' }]
		});
		expect(changed.subject).toBe(
			'Changed: Run sheet for Saturday 31 October 2026 at Hollow Pines Trail'
		);
		expect(changed.text).toContain('Crew call: 17:00 (was 17:30)');
		expect(changed.html).toContain('What changed');
		expect(changed.html).toContain('(was 17:30)');
	});
});

describe('schedule change e-mail', () => {
	it('shows each change with what it was and what it is now', () => {
		const { subject, html, text } = renderScheduleChange(
			demoScheduleChange('Hollow Pines Trail', origin)
		);
		expect(subject).toBe('Schedule change for Saturday 31 October 2026 at Hollow Pines Trail');
		expect(text).toContain('Crew call: 17:00 (was 17:30)');
		expect(html).toContain('line-through');
		expect(html).toContain('Room tech, Crow Loft');
	});
});

describe('template preview data', () => {
	it('renders all four templates, each with HTML and plain text', () => {
		const mails = demoMails('Hollow Pines Trail', origin);
		expect(mails.map((m) => m.id)).toEqual([
			'sign-in-link',
			'invitation',
			'run-sheet',
			'schedule-change'
		]);
		for (const m of mails) {
			expect(m.mail.html).toMatch(/^<!doctype html>/);
			expect(m.mail.text.length).toBeGreaterThan(40);
		}
	});
});

describe('what people typed, in every e-mail', () => {
	const hostile = `<script>alert("x")</script> & 'Q'`;
	// Svelte's escaping: < and & in text; &, " and < in attribute values.
	const asText = `&lt;script>alert("x")&lt;/script> &amp; 'Q'`;
	const sheet = demoRunSheet(hostile, origin);
	const mails = {
		'sign-in-link': renderSignInLink({ url: `${origin}/sign-in/x?a=1&b="2"`, email: hostile }),
		invitation: renderInvitation({
			url: `${origin}/invitations/x`,
			venueName: hostile,
			roleLabel: hostile,
			invitedBy: hostile,
			expiresOn: hostile
		}),
		'run-sheet': renderRunSheet({
			...sheet,
			person: { name: hostile },
			address: hostile,
			position: hostile,
			scenes: [{ name: hostile, room: hostile, cues: [hostile], warnings: [] }],
			checklist: [{ room: hostile, item: hostile }],
			faults: [{ room: hostile, prop: hostile, severity: hostile, seen: hostile }],
			safetyContacts: [{ name: hostile, role: hostile, phone: hostile, email: hostile }],
			showStop: [hostile],
			changes: [{ what: hostile, before: hostile, after: hostile }]
		}),
		'schedule-change': renderScheduleChange({
			...demoScheduleChange(hostile, origin),
			person: { name: hostile },
			changes: [{ what: hostile, before: hostile, after: hostile }],
			note: hostile
		})
	};

	for (const [id, mail] of Object.entries(mails)) {
		it(`${id}: is escaped in the HTML and kept as typed in the text`, () => {
			expect(mail.html).not.toContain('<script');
			expect(mail.html).not.toContain(hostile);
			expect(mail.html).toContain(asText);
			// Nothing typed closes an attribute: every quote inside one is an entity.
			for (const [, value] of mail.html.matchAll(/\s[\w-]+="([^"]*)"/g))
				expect(value).not.toMatch(/<|&(?!amp;|lt;|quot;|#)/);
			expect(mail.text).toContain(hostile);
		});
	}

	it('the sign-in link keeps its query intact inside the href', () => {
		expect(mails['sign-in-link'].html).toContain(
			'href="https://gloaming.example/sign-in/x?a=1&amp;b=&quot;2&quot;"'
		);
	});

	it('the run sheet escapes it in every section', () => {
		const html = mails['run-sheet'].html;
		// Person, address, position, scene, room, cue, checklist room and item, fault, contact
		// name, role, phone and e-mail, show stop, change: each at least once as text.
		expect(html.split(asText).length - 1).toBeGreaterThanOrEqual(15);
		expect(html).toContain('aria-label="Run sheet for &lt;script>alert(&quot;x&quot;)');
	});
});

/** E-mail kinds and delivery states, in the words the mail log uses. */
export const MAIL_KINDS = ['sign_in_link', 'invitation', 'run_sheet', 'schedule_change'] as const;
export type MailKind = (typeof MAIL_KINDS)[number];
/** 'withdrawn': taken back before it went, as its recipient left the venue or lost the role. */
export const MAIL_STATUSES = ['queued', 'sent', 'failed', 'withdrawn'] as const;
export type MailStatus = (typeof MAIL_STATUSES)[number];

export const MAIL_KIND_LABELS: Record<MailKind, string> = {
	sign_in_link: 'Sign-in link',
	invitation: 'Invitation',
	run_sheet: 'Run sheet',
	schedule_change: 'Schedule change'
};

export const MAIL_STATUS_LABELS: Record<MailStatus, string> = {
	queued: 'Queued',
	sent: 'Sent',
	failed: 'Failed',
	withdrawn: 'Withdrawn'
};

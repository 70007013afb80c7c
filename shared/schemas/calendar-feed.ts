/** A person's private iCalendar (RFC 5545) feed of due work. The URL is shown once, when made. */
export type CalendarFeedStatus = { active: boolean; createdAt: string | null; lastUsedAt: string | null; url: string | null };

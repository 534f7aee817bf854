// Intl formatters are costly to create (toLocaleString makes one per call): make each once.
const shortDateTime = new Intl.DateTimeFormat(undefined, { dateStyle: 'short', timeStyle: 'short' });
const mediumDateTime = new Intl.DateTimeFormat(undefined, { dateStyle: 'medium', timeStyle: 'short' });
const clockTime = new Intl.DateTimeFormat(undefined, { hour: '2-digit', minute: '2-digit' });

/** "02/12/2026, 08:05" in the tablet's locale. */
export const formatShortDateTime = (iso: string): string => shortDateTime.format(new Date(iso));
/** "2 Dec 2026, 08:05" in the tablet's locale. */
export const formatDateTime = (iso: string): string => mediumDateTime.format(new Date(iso));
/** "08:05" in the tablet's locale. */
export const formatClock = (iso: string): string => clockTime.format(new Date(iso));

/**
 * Photo uploads: the one definition of accepted types and sizes, read by the client (file
 * pickers, labels) and by the server (which checks the real type from the bytes).
 */
const MB = 1024 * 1024;

/** Types every browser shows: machine pictures and procedure photos. */
export const PHOTO_TYPES = ['image/jpeg', 'image/png', 'image/webp'] as const;

/** At the machine a phone camera may save HEIC or AVIF; a change photo is evidence, kept as taken. */
export const CHANGE_PHOTO_TYPES = [...PHOTO_TYPES, 'image/heic', 'image/avif'] as const;

/** Consumable-change and machine photos. */
export const PHOTO_MAX_BYTES = 8 * MB;

/** Procedure photos are printed on the placard PDF (up to eight of them), so they stay smaller. */
export const PROCEDURE_PHOTO_MAX_BYTES = 5 * MB;

/** "8" for 8 MB, for labels and messages. */
export const megabytes = (bytes: number) => bytes / MB;

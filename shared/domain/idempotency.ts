/** The header a client sends with a change it may have to send again (RFC draft "The Idempotency-Key HTTP Header Field"). */
export const IDEMPOTENCY_HEADER = 'Idempotency-Key';
/** 8–128 letters, digits, dashes or underscores: a UUID fits. */
export const IDEMPOTENCY_KEY_PATTERN = /^[A-Za-z0-9_-]{8,128}$/;
/** How long the server keeps an answer to replay it. */
export const IDEMPOTENCY_KEEP_HOURS = 24;

import type { Actor } from './policies';

/** How long the person who added a file may take it back; after that only a manager can. */
export const SELF_REMOVE_HOURS = 24;

export interface RemovableAttachment {
  siteId: string;
  uploadedBy: string | null;
  createdAt: Date;
}

export function canRemoveAttachment(actor: Actor, a: RemovableAttachment, now: Date): boolean {
  if (!actor.siteIds.includes(a.siteId)) return false;
  if (actor.role === 'manager') return true;
  const age = now.getTime() - a.createdAt.getTime();
  return a.uploadedBy === actor.id && age >= 0 && age < SELF_REMOVE_HOURS * 3_600_000;
}

const EXTENSIONS: Record<string, string> = {
  'image/jpeg': 'jpg',
  'image/png': 'png',
  'image/webp': 'webp',
  'image/heic': 'heic',
  'image/heif': 'heif',
  'application/pdf': 'pdf',
};

/** The uploaded name without any folder or extension, and without characters that could break a header. */
function stemOf(original: string | null | undefined) {
  const base = (original ?? '').replace(/^.*[\\/]/, '');
  const stem = base.includes('.') ? base.slice(0, base.lastIndexOf('.')) : base;
  return stem
    .replace(/[\p{Cc}\p{Cf}"\\:*?<>|%;]+/gu, '_')
    .replace(/\s+/g, ' ')
    .trim()
    .replace(/^[._\s]+/, '')
    .slice(0, 80);
}

/**
 * A file name safe inside a quoted Content-Disposition filename (RFC 6266): printable ASCII
 * only, with the extension of the detected type, so a photo named "notes.html" is offered as "notes.jpg".
 */
export function safeFileName(original: string | null | undefined, mime: string, suffix = ''): string {
  const ascii = stemOf(original)
    .normalize('NFKD')
    .replace(/[^\x20-\x7e]/g, '')
    .trim();
  return `${ascii || 'attachment'}${suffix}.${EXTENSIONS[mime] ?? 'bin'}`;
}

/**
 * The Content-Disposition value for showing a file in the browser: the ASCII name for every
 * client, plus the full UTF-8 name in RFC 8187 form when it differs (RFC 6266, section 4.3).
 */
export function inlineDisposition(original: string | null | undefined, mime: string, suffix = ''): string {
  const ascii = safeFileName(original, mime, suffix);
  const stem = stemOf(original);
  const full = stem ? `${stem}${suffix}.${EXTENSIONS[mime] ?? 'bin'}` : ascii;
  if (full === ascii) return `inline; filename="${ascii}"`;
  const encoded = encodeURIComponent(full).replace(/['()*]/g, (c) => `%${c.charCodeAt(0).toString(16).toUpperCase()}`);
  return `inline; filename="${ascii}"; filename*=UTF-8''${encoded}`;
}

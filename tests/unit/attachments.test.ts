import { describe, expect, it } from 'vitest';
import { canRemoveAttachment, inlineDisposition, safeFileName } from '../../shared/domain/attachments';

describe('file names for Content-Disposition', () => {
  it('encodes a non-ASCII name as RFC 6266 section 5 shows: filename*=utf-8\'\'%e2%82%ac%20rates', () => {
    // RFC 6266, section 5, example 4 ("€ rates"); hex digits are case-insensitive (RFC 3986, section 2.1).
    const h = inlineDisposition('€ rates.pdf', 'application/pdf');
    expect(h.toLowerCase()).toContain("filename*=utf-8''%e2%82%ac%20rates.pdf");
    expect(h).toMatch(/^inline; filename="rates\.pdf"; /);
  });

  it('keeps a plain ASCII name as a single quoted filename (RFC 6266, section 4.1)', () => {
    expect(inlineDisposition('IMG_2041.JPG', 'image/jpeg')).toBe('inline; filename="IMG_2041.jpg"');
  });

  it('drops folders, quotes and backslashes, and takes the extension from the detected type', () => {
    expect(safeFileName('..\\..\\win.ini', 'image/png')).toBe('win.png');
    expect(safeFileName('../../x"y\\z.html', 'image/jpeg')).toBe('z.jpg');
    expect(safeFileName('a"b.html', 'image/jpeg')).toBe('a_b.jpg');
    expect(safeFileName('', 'application/pdf')).toBe('attachment.pdf');
    expect(safeFileName(null, 'image/webp', '-preview')).toBe('attachment-preview.webp');
    expect(safeFileName('line\r\nbreak.jpg', 'image/jpeg')).toBe('line_break.jpg');
  });
});

describe('who may remove an attachment', () => {
  const added = new Date('2026-04-06T08:00:00Z');
  const a = { siteId: 's1', uploadedBy: 'u1', createdAt: added };
  const at = (hours: number) => new Date(added.getTime() + hours * 3_600_000);

  it('lets the uploader remove their own for 24 hours, a manager of the site at any time', () => {
    const desk = { id: 'u1', role: 'desk' as const, siteIds: ['s1'] };
    expect(canRemoveAttachment(desk, a, at(23.9))).toBe(true);
    expect(canRemoveAttachment(desk, a, at(24))).toBe(false);
    expect(canRemoveAttachment({ id: 'm', role: 'manager', siteIds: ['s1'] }, a, at(1000))).toBe(true);
    expect(canRemoveAttachment({ id: 'm', role: 'manager', siteIds: ['s2'] }, a, at(1))).toBe(false);
    expect(canRemoveAttachment({ id: 't', role: 'technician', siteIds: ['s1'] }, a, at(1))).toBe(false);
  });
});

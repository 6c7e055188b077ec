import { Router } from 'express';
import { desc, eq } from 'drizzle-orm';
import type { AppContext } from '../app';
import { requireRole } from '../middleware/auth';
import { validated } from '../middleware/validate';
import { caughtMail, outbox } from '../db/schema';
import { IdParamsSchema } from '../../shared/schemas/common';
import { notFound } from '../http-error';

export function adminMailRoutes(ctx: AppContext) {
  const r = Router();
  const db = ctx.database.db;

  // What the built-in mail catcher received, newest first.
  r.get('/', requireRole('admin'), async (_req, res) => {
    const rows = await db
      .select({ id: caughtMail.id, to: caughtMail.to, from: caughtMail.from, subject: caughtMail.subject, receivedAt: caughtMail.receivedAt })
      .from(caughtMail)
      .orderBy(desc(caughtMail.receivedAt))
      .limit(200);
    res.json({ items: rows.map((m) => ({ ...m, receivedAt: m.receivedAt.toISOString() })) });
  });

  r.get('/outbox', requireRole('admin'), async (_req, res) => {
    const rows = await db.select().from(outbox).orderBy(desc(outbox.createdAt)).limit(200);
    res.json({
      items: rows.map((m) => ({
        id: m.id,
        to: m.to,
        subject: m.subject,
        status: m.status,
        attempts: m.attempts,
        lastError: m.lastError,
        nextAttemptAt: m.nextAttemptAt.toISOString(),
        sentAt: m.sentAt?.toISOString() ?? null,
      })),
    });
  });

  // The message as a reader shows it: headers, plain text and HTML parts.
  r.get('/:id', requireRole('admin'), ...validated({ params: IdParamsSchema }, async (req, res, v) => {
    const { id } = v.params;
    const [m] = await db.select().from(caughtMail).where(eq(caughtMail.id, id));
    if (!m) throw notFound('That message');
    // Loaded when a message is first opened, not with every server.
    const { simpleParser } = await import('mailparser');
    const parsed = await simpleParser(m.raw);
    res.json({
      message: {
        id: m.id,
        to: m.to,
        from: m.from,
        subject: m.subject,
        receivedAt: m.receivedAt.toISOString(),
        text: parsed.text ?? '',
        html: typeof parsed.html === 'string' ? parsed.html : null,
      },
    });
  }));

  r.get('/:id/raw', requireRole('admin'), ...validated({ params: IdParamsSchema }, async (req, res, v) => {
    const { id } = v.params;
    const [m] = await db.select().from(caughtMail).where(eq(caughtMail.id, id));
    if (!m) throw notFound('That message');
    // RFC 5322 as received, so any mail reader can open it.
    res.setHeader('Content-Type', 'message/rfc822');
    res.setHeader('Content-Disposition', `inline; filename="${id}.eml"`);
    res.send(m.raw);
  }));
  return r;
}

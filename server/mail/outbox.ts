import { and, eq, lte, sql } from 'drizzle-orm';
import type { Transporter } from 'nodemailer';
import type { Db } from '../db/client';
import { outbox, type MailAttachment } from '../db/schema';

export interface OutgoingMail {
  dedupeKey: string;
  to: string;
  subject: string;
  text: string;
  html: string;
  attachments?: MailAttachment[];
}

export const MAX_ATTEMPTS = 6;
/** Minutes to wait after the n-th failed try (1 = first failure). */
export const backoffMinutes = (attempt: number) => [1, 5, 30, 120, 360][Math.min(attempt, 5) - 1] ?? 360;
const LEASE_MINUTES = 5;

/** Queues a message once: a second enqueue with the same key does nothing. Returns whether it was new. */
export async function enqueue(db: Pick<Db, 'insert'>, m: OutgoingMail, now = new Date()) {
  const rows = await db.insert(outbox).values({ ...m, createdAt: now, nextAttemptAt: now }).onConflictDoNothing({ target: outbox.dedupeKey }).returning({ id: outbox.id });
  return rows.length > 0;
}

export interface DeliveryReport {
  sent: number;
  retrying: number;
  failed: number;
}

/**
 * Sends what is due. Each message is first leased (its next attempt pushed forward in one
 * conditional update), so two instances never send the same message at once.
 */
export async function deliverOutbox(db: Db, transport: Transporter, from: string, now: Date): Promise<DeliveryReport> {
  const report: DeliveryReport = { sent: 0, retrying: 0, failed: 0 };
  const due = await db
    .select({ id: outbox.id })
    .from(outbox)
    .where(and(eq(outbox.status, 'pending'), lte(outbox.nextAttemptAt, now)))
    .limit(100);
  for (const { id } of due) {
    const lease = new Date(now.getTime() + LEASE_MINUTES * 60_000);
    const [m] = await db
      .update(outbox)
      .set({ nextAttemptAt: lease, attempts: sql`${outbox.attempts} + 1` })
      .where(and(eq(outbox.id, id), eq(outbox.status, 'pending'), lte(outbox.nextAttemptAt, now)))
      .returning();
    if (!m) continue;
    try {
      await transport.sendMail({ from, to: m.to, subject: m.subject, text: m.text, html: m.html, messageId: `<${m.id}@lashline>`, attachments: m.attachments ?? undefined });
      await db.update(outbox).set({ status: 'sent', sentAt: now, lastError: null }).where(eq(outbox.id, id));
      report.sent++;
    } catch (e) {
      const last = m.attempts >= MAX_ATTEMPTS;
      await db
        .update(outbox)
        .set({
          status: last ? 'failed' : 'pending',
          lastError: e instanceof Error ? e.message.slice(0, 500) : String(e),
          nextAttemptAt: new Date(now.getTime() + backoffMinutes(m.attempts) * 60_000),
        })
        .where(eq(outbox.id, id));
      if (last) report.failed++;
      else report.retrying++;
    }
  }
  return report;
}

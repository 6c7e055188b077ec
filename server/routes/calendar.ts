import { createHmac, timingSafeEqual } from 'node:crypto';
import { Router } from 'express';
import { eq, sql } from 'drizzle-orm';
import ical, { ICalEventStatus } from 'ical-generator';
import { z } from 'zod';
import type { AppContext } from '../app';
import { currentUser, publicRoute, signedIn } from '../middleware/auth';
import { validated } from '../middleware/validate';
import { users } from '../db/schema';
import { loadSessionUser } from '../services/users';
import { listDue } from '../services/due-list';
import { visitsForCalendar } from '../services/workshop-plan';
import { addDaysIso } from '../../shared/domain/dates';
import { notFound } from '../http-error';

const sign = (secret: string, userId: string, version: number) =>
  createHmac('sha256', secret).update(`calendar:${userId}:${version}`).digest('base64url');

/**
 * Calendar apps cannot sign in, so each person's feed lives at a secret address: the user id and a
 * version, signed with the server's secret. Resetting bumps the version, which kills the old address.
 */
export function calendarRoutes(ctx: AppContext) {
  const r = Router();
  const db = ctx.database.db;
  const feedUrl = async (req: import('express').Request, userId: string) => {
    const [u] = await db.select({ v: users.calendarFeedVersion }).from(users).where(eq(users.id, userId));
    return `${ctx.publicUrl(req)}/api/calendar/${userId}.${u.v}.${sign(ctx.sessionSecret, userId, u.v)}.ics`;
  };

  r.get('/feed', signedIn(), async (req, res) => {
    res.json({ url: await feedUrl(req, currentUser(req).id) });
  });

  r.post('/feed/reset', signedIn(), async (req, res) => {
    const id = currentUser(req).id;
    await db.update(users).set({ calendarFeedVersion: sql`${users.calendarFeedVersion} + 1` }).where(eq(users.id, id));
    res.json({ url: await feedUrl(req, id) });
  });

  const TokenParams = z.object({ token: z.string().regex(/^[0-9a-f-]{36}\.\d{1,9}\.[A-Za-z0-9_-]{43}\.ics$/) });
  r.get('/:token', publicRoute(), ...validated({ params: TokenParams }, async (req, res, { params }) => {
    const [userId, v, mac] = params.token.replace(/\.ics$/, '').split('.');
    const [row] = await db.select({ v: users.calendarFeedVersion }).from(users).where(eq(users.id, userId));
    const expected = row ? Buffer.from(sign(ctx.sessionSecret, userId, row.v)) : Buffer.alloc(43);
    if (!row || Number(v) !== row.v || !timingSafeEqual(expected, Buffer.from(mac))) throw notFound('That calendar feed');
    const user = await loadSessionUser(db, userId);
    if (!user) throw notFound('That calendar feed');
    const items = await listDue(db, user.siteIds, { within: 90 }, ctx.now());
    const cal = ical({ name: `Lashline: due work for ${user.name}`, prodId: { company: 'Lashline', product: 'due-feed' }, ttl: 3600 });
    for (const d of items) {
      if (!d.dueDate) continue;
      cal.createEvent({
        id: `${d.bikeId}-${d.itemId}@lashline`,
        // All-day events on the due date, given as plain dates so no time zone can shift the day.
        start: d.dueDate,
        end: addDaysIso(d.dueDate, 1),
        allDay: true,
        summary: `${d.status === 'overdue' ? 'OVERDUE: ' : ''}${d.fleetNumber} ${d.item}`,
        description: `${d.siteName} · ${d.modelName}\nDue by ${d.trigger ?? '—'}; ${d.remainingKm == null ? '' : `${Math.round(d.remainingKm)} km left; `}technician: ${d.assignee?.name ?? 'unassigned'}`,
        url: `${ctx.publicUrl(req)}/fleet/${d.bikeId}`,
      });
    }
    // Workshop visits, timed. The UID stays with the visit and SEQUENCE rises on every move
    // (RFC 5545 §3.8.7.4), so a calendar app updates the event rather than adding a second one.
    for (const v of await visitsForCalendar(db, user, ctx.now())) {
      cal.createEvent({
        id: `visit-${v.id}@lashline`,
        sequence: v.sequence,
        stamp: new Date(v.updatedAt),
        start: new Date(v.start),
        end: new Date(v.end),
        status: v.status === 'cancelled' ? ICalEventStatus.CANCELLED : ICalEventStatus.CONFIRMED,
        summary: `${v.status === 'cancelled' ? 'Cancelled: ' : ''}Workshop: ${v.fleetNumber} on ${v.bayName}`,
        description: `${v.siteName} · ${v.modelName} · technician: ${v.technicianName}\n${v.items.join('\n')}`,
        location: `${v.siteName}, ${v.bayName}`,
        url: `${ctx.publicUrl(req)}/plan`,
      });
    }
    res.setHeader('Content-Type', 'text/calendar; charset=utf-8');
    res.send(cal.toString());
  }));
  return r;
}

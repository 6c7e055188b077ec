import { asc, eq } from 'drizzle-orm';
import Papa from 'papaparse';
import type { DbOrTx } from '../db/client';
import { odometerReadings, users } from '../db/schema';
import type { MeasuredReading, ServiceRecord, ValveReadingView } from '../../shared/schemas/service-record';

export const HISTORY_CSV_COLUMNS = ['date', 'record', 'item', 'odometer', 'unit', 'odometer_km', 'signed_off_by', 'notes', 'readings'] as const;

const mm = (v: number) => `${v.toFixed(2)} mm`;
const valveText = (v: ValveReadingView) =>
  [
    `${v.label} ${mm(v.asFoundMm)}`,
    v.asLeftMm != null ? `left ${mm(v.asLeftMm)}` : null,
    v.shimAfterMm != null && v.shimAfterMm !== v.shimBeforeMm ? `shim ${v.shimBeforeMm?.toFixed(2) ?? '?'} → ${v.shimAfterMm.toFixed(2)} mm` : null,
    `spec ${v.specMinMm.toFixed(2)}–${v.specMaxMm.toFixed(2)} mm`,
  ].filter(Boolean).join(', ');
const measuredText = (m: MeasuredReading) => {
  const value = m.kind === 'check' ? (m.done ? 'done' : 'not done') : m.kind === 'date' ? (m.dateValue ?? '') : `${m.value ?? ''}${m.unit ? ` ${m.unit}` : ''}`;
  const limits = m.min != null || m.max != null ? ` (limits ${m.min ?? ''}–${m.max ?? ''}${m.unit ? ` ${m.unit}` : ''})` : '';
  return `${m.label} ${value}${limits}${m.outOfLimits ? ' OUT OF LIMITS' : ''}`;
};

/**
 * A bike's history as RFC 4180 CSV (CRLF line ends, quoted where needed): every service done and
 * every odometer reading, oldest first, distances in the bike's own unit and in km.
 */
export async function historyCsv(db: DbOrTx, record: ServiceRecord) {
  const unit = record.bike.odometerUnit;
  const readings = await db
    .select({ r: odometerReadings, by: users.name })
    .from(odometerReadings)
    .leftJoin(users, eq(users.id, odometerReadings.recordedBy))
    .where(eq(odometerReadings.bikeId, record.bike.id))
    .orderBy(asc(odometerReadings.date), asc(odometerReadings.odometerKm), asc(odometerReadings.createdAt));
  const rows = [
    ...record.services.map((s) => ({
      sort: [s.date, s.odometerKm, 1] as const,
      cells: [s.date, 'service', s.item, s.odometer, unit, s.odometerKm, s.signedOffBy ?? '', s.notes ?? '', [...s.valveReadings.map(valveText), ...s.readings.map(measuredText)].join('; ')],
    })),
    ...readings.map(({ r, by }) => ({
      sort: [r.date, r.odometerKm, 0] as const,
      cells: [r.date, 'odometer', r.reset ? 'Odometer replaced' : 'Odometer reading', r.value, r.unit, Math.round(r.odometerKm * 10) / 10, by ?? '', `From ${r.source}`, ''],
    })),
  ].sort((a, b) => a.sort[0].localeCompare(b.sort[0]) || a.sort[1] - b.sort[1] || a.sort[2] - b.sort[2]);
  const csv = Papa.unparse({ fields: [...HISTORY_CSV_COLUMNS], data: rows.map((r) => r.cells) }, { newline: '\r\n', quotes: false });
  return `${csv}\r\n`;
}

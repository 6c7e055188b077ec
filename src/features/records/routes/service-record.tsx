import { Link, useParams } from 'react-router-dom';
import { useQuery } from '@tanstack/react-query';
import { Button } from '../../../components/ui/button';
import { ErrorPanel, Loading } from '../../../components/ui/states';
import { formatDate, formatDateTime, formatOdometer } from '../../../lib/format';
import { BIKE_STATUS_LABELS, type BikeStatus } from '../../../../shared/schemas/bikes';
import { historyCsvHref, recordQueries } from '../api';
import { VisitTable, groupVisits } from '../components/visit-table';

const statusWord = (s: string | null) => (s && s in BIKE_STATUS_LABELS ? BIKE_STATUS_LABELS[s as BikeStatus] : (s ?? '—'));

// A4 with room for a binder's holes; the app's header is hidden in print by the shell's no-print class.
const PAGE = '@page { size: A4; margin: 14mm 12mm 16mm 18mm; }';

/** The bike's service record laid out for paper: what an owner, an insurer or a buyer asks to see. */
export function ServiceRecordRoute() {
  const { id = '' } = useParams();
  const q = useQuery(recordQueries.detail(id));
  if (q.isPending) return <Loading what="the service record" />;
  if (q.error) return <ErrorPanel error={q.error} retry={() => q.refetch()} />;
  const { site, bike, model, services, defects, statusChanges, generatedAt } = q.data;
  const fact = (label: string, value: string) => (
    <div>
      <dt className="text-xs uppercase tracking-wide text-ink-muted">{label}</dt>
      <dd className="num font-semibold">{value}</dd>
    </div>
  );
  return (
    <article className="mx-auto flex max-w-[210mm] flex-col gap-6 bg-paper-raised p-6 text-ink print:max-w-none print:bg-white print:p-0 print:text-black">
      <style>{PAGE}</style>
      <div className="flex flex-wrap items-center justify-between gap-3 print:hidden">
        <Link to={`/fleet/${bike.id}`} className="text-accent underline-offset-4 hover:underline">← {bike.fleetNumber}</Link>
        <div className="flex flex-wrap gap-2">
          <a href={historyCsvHref(bike.id)} download className="inline-flex min-h-tap items-center rounded-card border-2 border-ink-line px-4 font-semibold">Download history (CSV)</a>
          <Button onClick={() => window.print()}>Print</Button>
        </div>
      </div>

      <header className="border-b-2 border-ink pb-4">
        <p className="text-sm text-ink-soft print:text-black">{site.name} · Service record</p>
        <h1 className="text-display font-bold">{bike.fleetNumber} · {model.name}</h1>
        <dl className="mt-3 grid grid-cols-2 gap-x-6 gap-y-2 sm:grid-cols-3 print:grid-cols-3">
          {fact('VIN', bike.vin ?? 'none recorded')}
          {fact('Registration', bike.registration ?? '—')}
          {fact('Status', statusWord(bike.status))}
          {fact('In service since', `${formatDate(bike.inServiceDate)} at ${formatOdometer(bike.inServiceOdometer, bike.odometerUnit)}`)}
          {fact('Odometer now', `${formatOdometer(bike.latestOdometer, bike.odometerUnit)} (${formatDate(bike.latestReadingDate)})`)}
          {fact('Valve clearance spec (cold)', `intake ${model.intakeMinMm.toFixed(2)}–${model.intakeMaxMm.toFixed(2)} mm, exhaust ${model.exhaustMinMm.toFixed(2)}–${model.exhaustMaxMm.toFixed(2)} mm`)}
        </dl>
      </header>

      <section aria-labelledby="services" className="flex flex-col gap-4">
        <h2 id="services" className="text-xl font-bold">Services done ({services.length})</h2>
        {services.length ? groupVisits(services).map((v) => <VisitTable key={v.items[0].id} visit={v} unit={bike.odometerUnit} />) : <p>No service has been recorded yet.</p>}
      </section>

      <section aria-labelledby="defects" className="break-inside-avoid">
        <h2 id="defects" className="mb-2 text-xl font-bold">Defects reported ({defects.length})</h2>
        {defects.length ? (
          <ul className="flex flex-col gap-1 text-sm">
            {defects.map((d) => (
              <li key={d.id} className="num">
                {formatDateTime(d.reportedAt)} · {d.category}{d.safetyCritical ? ' (safety-critical)' : ''}: {d.text} · reported by {d.reportedBy ?? '—'} · {d.resolvedAt ? `resolved ${formatDateTime(d.resolvedAt)}` : 'open'}
              </li>
            ))}
          </ul>
        ) : <p className="text-sm">None.</p>}
      </section>

      <section aria-labelledby="status" className="break-inside-avoid">
        <h2 id="status" className="mb-2 text-xl font-bold">Status changes ({statusChanges.length})</h2>
        {statusChanges.length ? (
          <ul className="flex flex-col gap-1 text-sm">
            {statusChanges.map((c, i) => (
              <li key={i} className="num">
                {formatDateTime(c.at)} · {statusWord(c.from)} → {statusWord(c.to)}{c.reason ? `: ${c.reason}` : ''} · {c.by ?? 'Lashline (due scan)'}
              </li>
            ))}
          </ul>
        ) : <p className="text-sm">None.</p>}
      </section>

      <footer className="mt-4 border-t-2 border-ink pt-3 text-sm">
        <p>The maker’s service manual and a qualified technician decide, under local law.</p>
        <p className="num text-ink-muted print:text-black">Printed from Lashline on {formatDateTime(generatedAt)}.</p>
      </footer>
    </article>
  );
}

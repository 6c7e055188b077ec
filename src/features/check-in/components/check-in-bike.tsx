import { useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import { Button } from '../../../components/ui/button';
import { RideVerdictPanel } from '../../../components/ui/ride-verdict';
import { ErrorPanel, Loading } from '../../../components/ui/states';
import { BikeStatusBadge } from '../../../components/ui/status-badge';
import { ApiError } from '../../../lib/api-client';
import type { BikeDetail, BikeSummary } from '../../../../shared/schemas/bikes';
import { checkInQueries, type CheckInOutcome } from '../api';
import { CheckInForm } from './check-in-form';
import { QueuedPhotos } from './queued-photos';
import { CheckInVerdict, type DefectExtra } from './check-in-verdict';
import { handOutOutcome, handOutQuestion, useNextVisit, WorkshopNotice } from './workshop-notice';

export interface CheckInDone {
  bikeId: string;
  outcome: CheckInOutcome;
  defect: boolean;
  /** The defect was reported as safety-critical: offline, the device says so before the server can. */
  critical?: boolean;
}

interface Props {
  bikeId: string;
  result: CheckInDone | null;
  onDone: (r: CheckInOutcome, defect: boolean, critical: boolean) => void;
  defectExtra?: DefectExtra;
  onBack: () => void;
}

function BackButton({ onBack }: { onBack: () => void }) {
  return (
    <Button kind="secondary" className="min-h-14 self-start text-lg" onClick={onBack}>
      ← Choose another bike
    </Button>
  );
}

/**
 * Offline, a bike whose page this device never loaded is checked in from the list of bikes it
 * has: its state as of then stands in for the verdict, which the server gives on sending.
 */
function fromList(b: BikeSummary): BikeDetail {
  const reasons = b.status === 'in_service' ? [] : [b.statusReason ?? 'It was not in service when this device last loaded the fleet.'];
  return { bike: b, readings: [], due: [], ride: { mayRide: b.status === 'in_service', reasons } };
}

export function CheckInBike({ bikeId, result, onDone, onBack, defectExtra }: Props) {
  const q = useQuery(checkInQueries.bike(bikeId));
  const list = useQuery(checkInQueries.bikes());
  const listed = list.data?.items.find((b) => b.id === bikeId);
  const offline = q.fetchStatus === 'paused' || (q.error instanceof ApiError && q.error.code === 'network');
  if (q.data) return <CheckInLoaded bike={q.data} result={result} onDone={onDone} onBack={onBack} defectExtra={defectExtra} />;
  if (!q.data && offline && listed) return <CheckInLoaded bike={fromList(listed)} fromList result={result} onDone={onDone} onBack={onBack} defectExtra={defectExtra} />;
  if (q.isPending) return <Loading what="the bike" />;
  return (
    <>
      <ErrorPanel error={q.error} retry={() => q.refetch()} />
      <BackButton onBack={onBack} />
    </>
  );
}

function CheckInLoaded({ bike: { bike, ride }, fromList: listedOnly, result, onDone, onBack, defectExtra }: Omit<Props, 'bikeId'> & { bike: BikeDetail; fromList?: boolean }) {
  const next = useNextVisit(bike.id, bike.site.id);
  // The desk's answer when the bike is planned into the workshop today: out anyway, or kept back.
  const [goesOut, setGoesOut] = useState<boolean | null>(null);
  const today = next.visit?.today ? next.visit : null;
  if (result?.outcome.queued)
    return (
      <section aria-labelledby="check-in-queued" className="flex flex-col gap-4 rounded-card border-4 border-ink-line bg-paper-raised p-5">
        <h2 id="check-in-queued" className="text-2xl font-bold"><span aria-hidden>◌ </span>{bike.fleetNumber}: saved on this device</h2>
        <p className="text-lg">
          There is no connection, so the check-in waits here and is sent by itself when the connection is back. The server judges it then; if it
          cannot take it, it comes back to you at the top of the screen with the reason.
        </p>
        {/* What the device knew of the bike: the verdict on this reading comes when it is sent. */}
        <RideVerdictPanel ride={result.critical ? { mayRide: false, reasons: ['You reported a safety-critical defect: Lashline grounds the bike when the check-in arrives.', ...ride.reasons] } : ride} large />
        <p className="text-ink-soft">Whether the bike may go out is as this device last knew it. If in doubt, keep it back and ask the workshop.</p>
        {result.defect && <QueuedPhotos changeId={result.outcome.id} />}
        <Button className="min-h-14 self-start text-lg" onClick={onBack}>Next bike</Button>
      </section>
    );
  if (result && !result.outcome.queued)
    return (
      <>
        {today && goesOut !== null && (
          <p role="status" className="rounded-card border-4 border-state-soon bg-state-soon-soft p-4 text-lg font-semibold">
            <span aria-hidden>◔ </span>{handOutOutcome(bike.fleetNumber, today, goesOut)}
          </p>
        )}
        <CheckInVerdict result={result.outcome.data} defect={result.defect} onNext={onBack} defectExtra={defectExtra} />
      </>
    );
  return (
    <>
      <BackButton onBack={onBack} />
      <header className="flex flex-wrap items-center gap-3">
        <h2 className="text-4xl font-bold">{bike.fleetNumber}</h2>
        <BikeStatusBadge status={bike.status} />
        <p className="w-full text-lg text-ink-soft">
          {bike.registration ?? 'no registration'} · {bike.model.name} · {bike.site.name}
        </p>
      </header>
      {listedOnly && (
        <p role="status" className="rounded-card border-2 border-ink-line bg-paper-sunk p-3">
          <span aria-hidden>◌ </span>Offline: this bike's page is not on this device, so its state is from the list of bikes it last loaded.
        </p>
      )}
      {/* A bike that must not go out says so before anything is typed. */}
      {!ride.mayRide && <RideVerdictPanel ride={ride} large />}
      {bike.status !== 'retired' && <WorkshopNotice visit={next.visit} error={next.error} />}
      {bike.status === 'retired' ? (
        <p className="rounded-card border-2 border-ink-line bg-paper-sunk p-4 text-lg">
          ○ This bike is retired and is not checked in. A manager can bring it back into the fleet.
        </p>
      ) : (
        <CheckInForm bike={bike} onDone={onDone} handOut={today && ride.mayRide ? { question: handOutQuestion(bike.fleetNumber, today), onAnswer: setGoesOut } : undefined} />
      )}
    </>
  );
}

import { useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import { Button } from '../../../components/ui/button';
import { RideVerdictPanel } from '../../../components/ui/ride-verdict';
import { ErrorPanel, Loading } from '../../../components/ui/states';
import { BikeStatusBadge } from '../../../components/ui/status-badge';
import type { BikeDetail } from '../../../../shared/schemas/bikes';
import { checkInQueries, type CheckInResult } from '../api';
import { CheckInForm } from './check-in-form';
import { CheckInVerdict, type DefectExtra } from './check-in-verdict';
import { handOutOutcome, handOutQuestion, useNextVisit, WorkshopNotice } from './workshop-notice';

interface Props {
  bikeId: string;
  result: { data: CheckInResult; defect: boolean } | null;
  onDone: (r: CheckInResult, defect: boolean) => void;
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

export function CheckInBike({ bikeId, result, onDone, onBack, defectExtra }: Props) {
  const q = useQuery(checkInQueries.bike(bikeId));
  if (q.data) return <CheckInLoaded bike={q.data} result={result} onDone={onDone} onBack={onBack} defectExtra={defectExtra} />;
  if (q.isPending) return <Loading what="the bike" />;
  return (
    <>
      <ErrorPanel error={q.error} retry={() => q.refetch()} />
      <BackButton onBack={onBack} />
    </>
  );
}

function CheckInLoaded({ bike: { bike, ride }, result, onDone, onBack, defectExtra }: Omit<Props, 'bikeId'> & { bike: BikeDetail }) {
  const next = useNextVisit(bike.id, bike.site.id);
  // The desk's answer when the bike is planned into the workshop today: out anyway, or kept back.
  const [goesOut, setGoesOut] = useState<boolean | null>(null);
  const today = next.visit?.today ? next.visit : null;
  if (result)
    return (
      <>
        {today && goesOut !== null && (
          <p role="status" className="rounded-card border-4 border-state-soon bg-state-soon-soft p-4 text-lg font-semibold">
            <span aria-hidden>◔ </span>{handOutOutcome(bike.fleetNumber, today, goesOut)}
          </p>
        )}
        <CheckInVerdict result={result.data} defect={result.defect} onNext={onBack} defectExtra={defectExtra} />
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

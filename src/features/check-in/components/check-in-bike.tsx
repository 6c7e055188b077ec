import { useQuery } from '@tanstack/react-query';
import { Button } from '../../../components/ui/button';
import { RideVerdictPanel } from '../../../components/ui/ride-verdict';
import { ErrorPanel, Loading } from '../../../components/ui/states';
import { BikeStatusBadge } from '../../../components/ui/status-badge';
import { checkInQueries, type CheckInResult } from '../api';
import { CheckInForm } from './check-in-form';
import { CheckInVerdict, type DefectExtra } from './check-in-verdict';

interface Props {
  bikeId: string;
  result: { data: CheckInResult; defect: boolean } | null;
  onDone: (r: CheckInResult, defect: boolean) => void;
  defectExtra?: DefectExtra;
  onBack: () => void;
}

export function CheckInBike({ bikeId, result, onDone, onBack, defectExtra }: Props) {
  const q = useQuery(checkInQueries.bike(bikeId));
  const back = (
    <Button kind="secondary" className="min-h-14 self-start text-lg" onClick={onBack}>
      ← Choose another bike
    </Button>
  );
  if (q.isPending) return <Loading what="the bike" />;
  if (q.error)
    return (
      <>
        <ErrorPanel error={q.error} retry={() => q.refetch()} />
        {back}
      </>
    );
  const { bike, ride } = q.data;
  if (result) return <CheckInVerdict result={result.data} defect={result.defect} onNext={onBack} defectExtra={defectExtra} />;
  return (
    <>
      {back}
      <header className="flex flex-wrap items-center gap-3">
        <h2 className="text-4xl font-bold">{bike.fleetNumber}</h2>
        <BikeStatusBadge status={bike.status} />
        <p className="w-full text-lg text-ink-soft">
          {bike.registration ?? 'no registration'} · {bike.model.name} · {bike.site.name}
        </p>
      </header>
      {/* A bike that must not go out says so before anything is typed. */}
      {!ride.mayRide && <RideVerdictPanel ride={ride} large />}
      {bike.status === 'retired' ? (
        <p className="rounded-card border-2 border-ink-line bg-paper-sunk p-4 text-lg">
          ○ This bike is retired and is not checked in. A manager can bring it back into the fleet.
        </p>
      ) : (
        <CheckInForm bike={bike} onDone={onDone} />
      )}
    </>
  );
}

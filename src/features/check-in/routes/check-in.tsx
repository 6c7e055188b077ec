import { useState } from 'react';
import { useSearchParams } from 'react-router-dom';
import { useQuery } from '@tanstack/react-query';
import { Empty, ErrorPanel, Loading, PageHeader, SafetyNote } from '../../../components/ui/states';
import { checkInQueries } from '../api';
import { BikeFinder } from '../components/bike-finder';
import { CheckInBike, type CheckInDone } from '../components/check-in-bike';
import type { DefectExtra } from '../components/check-in-verdict';

/** The counter's screen: find the bike, type the odometer, see at once whether it may go out. */
export function CheckInRoute({ defectExtra }: { defectExtra?: DefectExtra } = {}) {
  const [params, setParams] = useSearchParams();
  // The chosen bike lives in the address, so a reload comes back to the same bike and its draft.
  const bikeId = params.get('bike');
  const [result, setResult] = useState<CheckInDone | null>(null);
  const bikes = useQuery(checkInQueries.bikes());
  const pick = (id: string | null) => {
    setResult(null);
    setParams(id ? { bike: id } : {}, { replace: false });
    window.scrollTo(0, 0);
  };

  return (
    <div className="mx-auto flex max-w-4xl flex-col gap-5">
      <PageHeader title="Check-in" />
      {bikeId ? (
        <CheckInBike bikeId={bikeId} result={result?.bikeId === bikeId ? result : null} onDone={(outcome, defect, critical) => { setResult({ bikeId, outcome, defect, critical }); window.scrollTo(0, 0); }} onBack={() => pick(null)} defectExtra={defectExtra} />
      ) : bikes.isPending ? (
        <Loading what="the bikes at your sites" />
      ) : bikes.error ? (
        <ErrorPanel error={bikes.error} retry={() => bikes.refetch()} />
      ) : bikes.data.items.length === 0 ? (
        <Empty title="No bikes at your sites">A manager adds bikes to the fleet and sets which sites you work at.</Empty>
      ) : (
        <BikeFinder bikes={bikes.data.items} onPick={pick} />
      )}
      <SafetyNote />
    </div>
  );
}

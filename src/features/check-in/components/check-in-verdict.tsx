import type { ReactNode } from 'react';
import { Button } from '../../../components/ui/button';
import { RideVerdictPanel } from '../../../components/ui/ride-verdict';
import { formatDate, formatOdometer } from '../../../lib/format';
import type { CheckInResult } from '../api';
import { NextDue } from './next-due';

export type DefectExtra = (bikeId: string, defectId: string) => ReactNode;

export function CheckInVerdict({ result, defect, onNext, defectExtra }: { result: CheckInResult; defect: boolean; onNext: () => void; defectExtra?: DefectExtra }) {
  const { reading, bike } = result;
  return (
    <div className="flex flex-col gap-5">
      <h2 className="text-4xl font-bold">
        {bike.fleetNumber} <span className="text-xl font-normal text-ink-soft">{bike.model.name} · {bike.site.name}</span>
      </h2>
      <RideVerdictPanel ride={result.ride} large />
      <p role="status" className="num text-lg">
        ✓ Saved for {bike.fleetNumber}: {formatOdometer(reading.value, reading.unit)} on {formatDate(reading.date)}
        {reading.reset && ' (start of the new odometer)'}.
      </p>
      {defect && !result.grounded && <p className="text-lg">✓ The defect is recorded for the workshop.</p>}
      {result.grounded && (
        <p className="rounded-card border-2 border-state-stop bg-state-stop-soft p-4 text-lg font-semibold text-state-stop">
          ■ The defect is recorded and the bike is now grounded. The manager has been told by e-mail.
        </p>
      )}
      {result.defectId && defectExtra?.(bike.id, result.defectId)}
      <section aria-labelledby="next-due">
        <h2 id="next-due" className="mb-2 text-xl font-bold">Next service work</h2>
        <NextDue bikeId={bike.id} items={result.due} />
      </section>
      <Button className="min-h-16 self-start px-10 text-xl" onClick={onNext}>
        Check in another bike
      </Button>
    </div>
  );
}

import { useParams } from 'react-router-dom';
import { useQuery } from '@tanstack/react-query';
import { ErrorPanel, Loading } from '../../../components/ui/states';
import { valveQueries } from '../api';
import { ValveCardScreen } from '../components/valve-card-screen';

/** The valve clearance card of one task: a reading per valve, the shims, and sign-off. */
export function ValveCardRoute() {
  const { id = '' } = useParams();
  const q = useQuery(valveQueries.card(id));
  if (q.isPending) return <Loading what="the valve card" />;
  if (q.error) return <ErrorPanel error={q.error} retry={() => q.refetch()} />;
  // A new task id is a new card: its draft is read afresh.
  return <ValveCardScreen key={id} card={q.data} />;
}

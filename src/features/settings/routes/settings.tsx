import { useQuery } from '@tanstack/react-query';
import { ErrorPanel, Loading, PageHeader, SafetyNote } from '../../../components/ui/states';
import { settingsQueries } from '../../../lib/settings-queries';
import { useMe } from '../../../lib/use-me';
import { canAdminister } from '../../../../shared/domain/policies';
import { TreadForm } from '../components/tread-form';

export function SettingsRoute() {
  const me = useMe();
  const q = useQuery(settingsQueries.current());
  return (
    <>
      <PageHeader title="Settings" />
      {q.isPending ? <Loading what="settings" /> : q.error ? <ErrorPanel error={q.error} retry={() => q.refetch()} /> : <TreadForm current={q.data} canEdit={canAdminister(me)} />}
      <SafetyNote />
    </>
  );
}

import { Link, useLocation, useParams } from 'react-router-dom';
import { useQuery } from '@tanstack/react-query';
import { ErrorPanel, Loading, PageHeader, SafetyNote } from '../../../components/ui/states';
import { useMe } from '../../../lib/use-me';
import { planQueries } from '../api';
import { ModelForm } from '../components/model-form';
import { ServicePlan } from '../components/service-plan';

const Back = () => <Link to="/plans" className="text-accent underline-offset-4 hover:underline">← Models and plans</Link>;

function ReadOnlyNote() {
  return <p className="rounded-card border-2 border-ink-line bg-paper-sunk px-4 py-2 text-ink-soft">You can read this plan; a fleet manager changes models and service plans.</p>;
}

export function ModelNewRoute() {
  const me = useMe();
  return (
    <div className="flex flex-col gap-5">
      <Back />
      <PageHeader title="Add a model" />
      {me.role !== 'manager' && <ReadOnlyNote />}
      <ModelForm model={null} bikes={0} canEdit={me.role === 'manager'} />
      <p className="text-ink-soft">Once the model is added, give it its service plan on the next screen.</p>
      <SafetyNote />
    </div>
  );
}

/** One model: its engine and valve specs, then its service plan. */
export function ModelEditorRoute() {
  const { id = '' } = useParams();
  const me = useMe();
  const created = (useLocation().state as { created?: boolean } | null)?.created;
  const q = useQuery(planQueries.detail(id));
  if (q.isPending) return <Loading what="the model" />;
  if (q.error) return <ErrorPanel error={q.error} retry={() => q.refetch()} />;
  const canEdit = me.role === 'manager';
  const { model, bikes } = q.data;
  return (
    <div className="flex flex-col gap-5">
      <Back />
      <PageHeader title={model.name}>
        <span className="num text-lg text-ink-soft">{bikes === 1 ? '1 bike' : `${bikes} bikes`} in the fleet</span>
      </PageHeader>
      {created && <p role="status" className="rounded-card border-2 border-state-ok bg-state-ok-soft px-3 py-2 font-semibold">✓ Model added. Now give it its service plan below.</p>}
      {!canEdit && <ReadOnlyNote />}
      {/* Keyed by model, so moving to another model starts from its own values. */}
      <ModelForm key={model.id} model={model} bikes={bikes} canEdit={canEdit} />
      <ServicePlan detail={q.data} canEdit={canEdit} />
      <SafetyNote />
    </div>
  );
}

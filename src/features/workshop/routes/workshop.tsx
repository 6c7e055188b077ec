import { useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import { Empty, ErrorPanel, Loading, PageHeader } from '../../../components/ui/states';
import { Segmented } from '../../../components/ui/segmented';
import { todayInZone } from '../../../../shared/domain/dates';
import { workshopQueries } from '../api';
import { BaysPanel } from '../components/bays-panel';
import { HoursPanel } from '../components/hours-panel';
import { TechnicianCard } from '../components/technician-card';

/** Per site: its bays, opening hours, and each technician's working patterns and time off. */
export function WorkshopRoute() {
  const q = useQuery(workshopQueries.capacity());
  const [chosen, setChosen] = useState<string | null>(null);
  if (q.isPending) return <Loading what="the workshop" />;
  if (q.error) return <ErrorPanel error={q.error} retry={() => q.refetch()} />;
  const sites = q.data.sites;
  if (!sites.length)
    return (
      <>
        <PageHeader title="Workshop" />
        <Empty title="No sites">You work at no site yet. Ask an administrator to add you to one.</Empty>
      </>
    );
  const site = sites.find((s) => s.id === chosen) ?? sites[0];
  const today = todayInZone(site.timeZone);
  return (
    <>
      <PageHeader title="Workshop">
        {sites.length > 1 && <Segmented legend="Site" quietLegend value={site.id} onChange={setChosen} options={sites.map((s) => ({ value: s.id, label: s.name }))} />}
      </PageHeader>
      <p className="mb-4 text-ink-soft">What the planner may use at {site.name}: bays, opening hours and the technicians’ working time. Changes here re-plan the coming days.</p>
      <div key={site.id} className="grid gap-4 lg:grid-cols-2">
        <BaysPanel site={site} />
        <HoursPanel site={site} />
      </div>
      <h2 className="mt-6 text-xl font-bold">Technicians</h2>
      {site.technicians.length === 0 ? (
        <Empty title="No technicians at this site">Give a person the technician role and this site under Admin → People.</Empty>
      ) : (
        <div key={`t-${site.id}`} className="mt-3 grid gap-4 lg:grid-cols-2">
          {site.technicians.map((t) => (
            <TechnicianCard key={t.id} site={site} tech={t} today={today} />
          ))}
        </div>
      )}
    </>
  );
}

import { useParams } from 'react-router-dom';
import { useQuery } from '@tanstack/react-query';
import { Button } from '../../../components/ui/button';
import { Empty, ErrorPanel, Loading, PageHeader } from '../../../components/ui/states';
import { mailQueries } from '../api';
import { JobButtons } from '../components/job-buttons';
import { MailList } from '../components/mail-list';
import { MessageView } from '../components/message-view';
import { OutboxTable } from '../components/outbox-table';

/** What Lashline sent and what the built-in catcher received, and the jobs behind them. */
export function MailRoute() {
  const { id } = useParams();
  const list = useQuery(mailQueries.list());
  const outbox = useQuery(mailQueries.outbox());
  return (
    <div className="flex flex-col gap-8">
      <PageHeader title="Mail and jobs">
        <Button kind="secondary" onClick={() => { void list.refetch(); void outbox.refetch(); }}>Check for new mail</Button>
      </PageHeader>
      <section aria-labelledby="jobs" className="flex flex-col gap-3">
        <h2 id="jobs" className="text-xl font-bold">Jobs</h2>
        <JobButtons />
      </section>
      <section aria-labelledby="caught" className="flex flex-col gap-3">
        <h2 id="caught" className="text-xl font-bold">Caught mail</h2>
        <p className="max-w-3xl text-ink-soft">Without an SMTP server configured, Lashline keeps every message it sends here instead of delivering it.</p>
        {list.isPending ? (
          <Loading what="the caught mail" />
        ) : list.error ? (
          <ErrorPanel error={list.error} retry={() => list.refetch()} />
        ) : list.data.items.length === 0 ? (
          <Empty title="No mail caught yet">Run “Send the weekly due list” above to see one arrive.</Empty>
        ) : (
          <div className="grid gap-4 lg:grid-cols-[minmax(16rem,1fr)_2fr]">
            <MailList items={list.data.items} />
            {id ? <MessageView id={id} /> : <Empty title="Choose a message">Pick one from the list to read it as its recipient would.</Empty>}
          </div>
        )}
      </section>
      <section aria-labelledby="outbox" className="flex flex-col gap-3">
        <h2 id="outbox" className="text-xl font-bold">Outbox</h2>
        {outbox.isPending ? <Loading what="the outbox" /> : outbox.error ? <ErrorPanel error={outbox.error} retry={() => outbox.refetch()} /> : <OutboxTable items={outbox.data.items} />}
      </section>
    </div>
  );
}

import { useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import { Button } from '../../../components/ui/button';
import { ErrorPanel, Loading } from '../../../components/ui/states';
import { formatDateTime } from '../../../lib/format';
import { mailQueries } from '../api';

/** One message as a mail reader shows it. The HTML part runs in an iframe with every permission withheld. */
export function MessageView({ id }: { id: string }) {
  const q = useQuery(mailQueries.message(id));
  const [plain, setPlain] = useState(false);
  if (q.isPending) return <Loading what="the message" />;
  if (q.error) return <ErrorPanel error={q.error} retry={() => q.refetch()} />;
  const m = q.data.message;
  const showHtml = m.html !== null && !plain;
  return (
    <article aria-label="Message" className="flex flex-col gap-3 rounded-card border-2 border-ink-line bg-paper-raised p-5">
      <h2 className="text-xl font-bold">{m.subject || '(no subject)'}</h2>
      <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1">
        <dt className="text-ink-muted">From</dt>
        <dd className="break-all">{m.from}</dd>
        <dt className="text-ink-muted">To</dt>
        <dd className="break-all">{m.to}</dd>
        <dt className="text-ink-muted">Received</dt>
        <dd className="num">{formatDateTime(m.receivedAt)}</dd>
      </dl>
      <div className="flex flex-wrap gap-2">
        {m.html !== null && (
          <Button kind="secondary" onClick={() => setPlain(!plain)}>
            {plain ? 'Show as formatted' : 'Show the plain text'}
          </Button>
        )}
        <a href={`/api/admin/mail/${m.id}/raw`} download={`${m.id}.eml`} className="inline-flex min-h-tap items-center rounded-card px-4 font-semibold text-accent underline-offset-4 hover:underline">
          ⤓ Download as .eml
        </a>
      </div>
      {showHtml ? (
        <iframe title={`Message: ${m.subject}`} sandbox="" srcDoc={m.html!} className="h-[60vh] w-full resize-y rounded-card border-2 border-ink-line bg-white" />
      ) : (
        <pre className="max-h-[60vh] overflow-auto whitespace-pre-wrap rounded-card border-2 border-ink-line bg-paper p-4 font-sans">{m.text || '(this message has no text part)'}</pre>
      )}
    </article>
  );
}

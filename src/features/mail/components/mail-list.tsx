import { NavLink } from 'react-router-dom';
import { formatDateTime } from '../../../lib/format';
import type { CaughtMail } from '../api';

/** What the built-in mail catcher received, newest first; one opens beside the list. */
export function MailList({ items }: { items: CaughtMail[] }) {
  return (
    <ul aria-label="Caught mail" className="max-h-[70vh] self-start divide-y divide-ink-line overflow-y-auto rounded-card border-2 border-ink-line bg-paper-raised">
      {items.map((m) => (
        <li key={m.id}>
          <NavLink
            to={`/admin/mail/${m.id}`}
            preventScrollReset
            className={({ isActive }) => `block min-h-tap px-4 py-3 ${isActive ? 'bg-accent-soft' : 'hover:bg-paper-sunk'}`}
          >
            <span className="block font-semibold">{m.subject || '(no subject)'}</span>
            <span className="block text-sm text-ink-soft">To {m.to}</span>
            <span className="num block text-sm text-ink-muted">{formatDateTime(m.receivedAt)}</span>
          </NavLink>
        </li>
      ))}
    </ul>
  );
}

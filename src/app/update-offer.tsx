import { useState } from 'react';
import { Button } from '../components/ui/button';
import { useUpdateOffer } from '../lib/offline/updates';

/** "A new version is ready": the person chooses when to reload, so nothing typed is interrupted. */
export function UpdateOffer() {
  const take = useUpdateOffer();
  const [later, setLater] = useState(false);
  if (!take || later) return null;
  return (
    <div role="status" className="no-print border-b-2 border-ink-line bg-paper-raised">
      <div className="mx-auto flex max-w-7xl flex-wrap items-center gap-3 px-4 py-2">
        <span>A new version of Lashline is ready. Finish what you are typing first: drafts are kept either way.</span>
        <Button onClick={take}>Use the new version</Button>
        <Button kind="secondary" onClick={() => setLater(true)}>Later</Button>
      </div>
    </div>
  );
}

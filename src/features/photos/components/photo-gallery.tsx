import { useEffect, useRef, useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import { Button } from '../../../components/ui/button';
import { ErrorPanel, Loading } from '../../../components/ui/states';
import { toast } from '../../../components/ui/toast';
import { formatDateTime } from '../../../lib/format';
import { useMe } from '../../../lib/use-me';
import type { Attachment, AttachmentListQuery } from '../../../../shared/schemas/attachments';
import { canRemoveAttachment } from '../../../../shared/domain/attachments';
import { photoQueries, useRemovePhoto } from '../api';

interface Props {
  bikeId: string;
  /** Only the files of one defect or one task. */
  filter?: AttachmentListQuery;
  empty?: string;
}

/** A bike's photos as a grid of previews and its documents as tiles; a photo opens full size. */
export function PhotoGallery({ bikeId, filter = {}, empty = 'No photos or documents yet.' }: Props) {
  const q = useQuery(photoQueries.list(bikeId, filter));
  const [open, setOpen] = useState<Attachment | null>(null);
  if (q.isPending) return <Loading what="photos" />;
  if (q.error) return <ErrorPanel error={q.error} retry={() => q.refetch()} />;
  const items = q.data.items;
  if (!items.length) return <p className="text-ink-soft">{empty}</p>;
  return (
    <>
      <ul className="grid grid-cols-3 gap-2 sm:grid-cols-4 lg:grid-cols-6">
        {items.map((a) => (
          <li key={a.id}>
            {a.kind === 'document' ? (
              <a href={a.url} target="_blank" rel="noopener" className="flex aspect-square flex-col items-center justify-center gap-1 rounded-card border-2 border-ink-line bg-paper-raised p-2 text-center hover:border-accent">
                <span className="text-lg font-bold text-accent">PDF</span>
                <span className="line-clamp-2 break-all text-sm">{a.name}</span>
              </a>
            ) : (
              <button type="button" onClick={() => setOpen(a)} className="block aspect-square w-full overflow-hidden rounded-card border-2 border-ink-line bg-paper-sunk hover:border-accent focus-visible:border-accent">
                {a.thumbUrl ? (
                  <img src={a.thumbUrl} alt={`Photo ${a.name}, added ${formatDateTime(a.createdAt)}`} loading="lazy" className="h-full w-full object-cover" />
                ) : (
                  <span className="flex h-full items-center justify-center p-2 text-sm text-ink-soft">{a.name}</span>
                )}
              </button>
            )}
          </li>
        ))}
      </ul>
      {open && <PhotoViewer attachment={open} onClose={() => setOpen(null)} />}
    </>
  );
}

function PhotoViewer({ attachment: a, onClose }: { attachment: Attachment; onClose: () => void }) {
  const ref = useRef<HTMLDialogElement>(null);
  const me = useMe();
  const remove = useRemovePhoto(a.bikeId);
  useEffect(() => {
    const d = ref.current;
    if (d && !d.open) d.showModal?.();
  }, []);
  const removable = canRemoveAttachment(me, { siteId: a.siteId, uploadedBy: a.uploadedBy, createdAt: new Date(a.createdAt) }, new Date());
  const removeIt = () =>
    remove.mutate(a.id, {
      onSuccess: () => {
        toast(`${a.name} was removed.`);
        onClose();
      },
      onError: (e) => toast(e.message),
    });
  return (
    <dialog ref={ref} onClose={onClose} aria-label={a.name} className="m-auto max-h-[95vh] max-w-[95vw] rounded-card bg-paper-raised p-0 backdrop:bg-ink/70">
      <div className="flex flex-col gap-3 p-4">
        <img src={a.url} alt={`Photo ${a.name}`} className="max-h-[75vh] w-auto object-contain" />
        <div className="flex flex-wrap items-center justify-between gap-3">
          <p className="text-sm text-ink-soft">
            {a.name} · added {formatDateTime(a.createdAt)}
            {a.uploaderName && ` by ${a.uploaderName}`}
          </p>
          <div className="flex flex-wrap gap-2">
            <a href={a.url} target="_blank" rel="noopener" className="inline-flex min-h-tap items-center px-3 text-accent underline-offset-4 hover:underline">
              Open full size
            </a>
            {removable && (
              <Button kind="danger" disabled={remove.isPending} onClick={removeIt}>
                {remove.isPending ? 'Removing…' : 'Remove'}
              </Button>
            )}
            <Button kind="secondary" onClick={() => ref.current?.close()}>
              Close
            </Button>
          </div>
        </div>
      </div>
    </dialog>
  );
}

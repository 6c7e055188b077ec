import { useEffect, useRef, useState, type ChangeEvent } from 'react';
import { Button } from '../../../components/ui/button';
import { ApiError } from '../../../lib/api-client';
import { ACCEPT_ATTRIBUTE, DEFAULT_UPLOAD_MAX_BYTES, type Attachment } from '../../../../shared/schemas/attachments';
import { useUploadPhoto } from '../api';

interface Props {
  bikeId: string;
  defectId?: string;
  taskId?: string;
  /** The server's limit, when it is set to something other than 8 MB. */
  maxBytes?: number;
  onUploaded?: (a: Attachment) => void;
}

type Item = { key: number; file: File; preview: string | null; state: 'waiting' | 'sending' | 'done' | 'failed'; message?: string };

const mb = (bytes: number) => `${Math.round((bytes / 1048576) * 10) / 10} MB`;
// Browsers other than Safari cannot show HEIC, so those get a plain tile instead of a broken image.
const previewable = (f: File) => ['image/jpeg', 'image/png', 'image/webp', 'image/gif'].includes(f.type);

/**
 * Adds photos (or a PDF) to a bike, a defect or a task. The big button opens the camera on a
 * phone; "Choose a file" opens the library and the file system.
 */
export function PhotoUpload({ bikeId, defectId, taskId, maxBytes = DEFAULT_UPLOAD_MAX_BYTES, onUploaded }: Props) {
  const camera = useRef<HTMLInputElement>(null);
  const picker = useRef<HTMLInputElement>(null);
  const [items, setItems] = useState<Item[]>([]);
  const upload = useUploadPhoto(bikeId);
  const nextKey = useRef(1);

  const previews = useRef(new Set<string>());
  useEffect(() => () => previews.current.forEach((u) => URL.revokeObjectURL(u)), []);

  const patch = (key: number, p: Partial<Item>) => setItems((list) => list.map((i) => (i.key === key ? { ...i, ...p } : i)));

  async function send(files: FileList | null) {
    if (!files?.length) return;
    const added: Item[] = Array.from(files, (file) => {
      const preview = previewable(file) ? URL.createObjectURL(file) : null;
      if (preview) previews.current.add(preview);
      return { key: nextKey.current++, file, preview, state: 'waiting' };
    });
    setItems((list) => [...list, ...added]);
    // One at a time: a phone on a workshop's wifi does better with one upload than with five.
    for (const item of added) {
      if (item.file.size > maxBytes) {
        patch(item.key, { state: 'failed', message: `Larger than ${mb(maxBytes)}. Take it at a lower resolution.` });
        continue;
      }
      patch(item.key, { state: 'sending' });
      try {
        const { attachment } = await upload.mutateAsync({ file: item.file, defectId, taskId });
        patch(item.key, { state: 'done' });
        onUploaded?.(attachment);
      } catch (e) {
        patch(item.key, { state: 'failed', message: e instanceof ApiError ? e.message : 'The upload failed. Try again.' });
      }
    }
  }

  const done = items.filter((i) => i.state === 'done' || i.state === 'failed').length;
  const sending = items.some((i) => i.state === 'sending' || i.state === 'waiting');
  const onChange = (e: ChangeEvent<HTMLInputElement>) => {
    void send(e.target.files);
    e.target.value = '';
  };

  return (
    <div className="flex flex-col gap-3">
      <div className="flex flex-wrap items-center gap-3">
        <Button className="min-h-14 px-8 text-lg" onClick={() => camera.current?.click()}>
          <span aria-hidden>＋</span> Add a photo
        </Button>
        <Button kind="quiet" onClick={() => picker.current?.click()}>
          Choose a file
        </Button>
        <input ref={camera} type="file" accept={ACCEPT_ATTRIBUTE} capture="environment" className="sr-only" tabIndex={-1} aria-hidden onChange={onChange} />
        <input ref={picker} type="file" accept={ACCEPT_ATTRIBUTE} multiple className="sr-only" tabIndex={-1} aria-hidden onChange={onChange} />
      </div>
      {items.length > 0 && (
        <div aria-live="polite">
          {sending && (
            <div className="mb-2">
              <label className="text-sm text-ink-soft" htmlFor={`upload-${bikeId}`}>
                Sending {Math.min(done + 1, items.length)} of {items.length}…
              </label>
              <progress id={`upload-${bikeId}`} className="block h-2 w-full accent-accent" max={items.length} value={done} />
            </div>
          )}
          <ul className="grid grid-cols-3 gap-2 sm:grid-cols-5">
            {items.map((i) => (
              <li key={i.key} className="flex flex-col gap-1">
                <div className={`relative aspect-square overflow-hidden rounded-card border-2 bg-paper-sunk ${i.state === 'failed' ? 'border-state-stop' : 'border-ink-line'}`}>
                  {i.preview ? (
                    <img src={i.preview} alt="" className={`h-full w-full object-cover ${i.state === 'done' ? '' : 'opacity-60'}`} />
                  ) : (
                    <span className="flex h-full items-center justify-center p-2 text-center text-sm font-semibold text-ink-soft">{i.file.name}</span>
                  )}
                  {i.state === 'sending' && <span className="absolute inset-x-0 bottom-0 h-1 animate-pulse bg-accent" aria-hidden />}
                </div>
                <span className={`text-sm ${i.state === 'failed' ? 'text-state-stop' : 'text-ink-soft'}`}>
                  {i.state === 'done' ? 'Added ✓' : i.state === 'failed' ? i.message : i.state === 'sending' ? 'Sending…' : 'Waiting'}
                </span>
              </li>
            ))}
          </ul>
        </div>
      )}
    </div>
  );
}

import { useRef, useState, type ChangeEvent } from 'react';
import { Button } from '../../../components/ui/button';
import { attachPhotos } from '../../../lib/offline/queue';
import { ACCEPT_ATTRIBUTE, DEFAULT_UPLOAD_MAX_BYTES } from '../../../../shared/schemas/attachments';

/**
 * Photos of a defect reported offline: kept on the device with the check-in, and sent to the
 * defect once the check-in has been taken.
 */
export function QueuedPhotos({ changeId }: { changeId: string }) {
  const camera = useRef<HTMLInputElement>(null);
  const [names, setNames] = useState<string[]>([]);
  const [problem, setProblem] = useState<string | null>(null);
  const onChange = async (e: ChangeEvent<HTMLInputElement>) => {
    const files = Array.from(e.target.files ?? []);
    e.target.value = '';
    const tooBig = files.filter((f) => f.size > DEFAULT_UPLOAD_MAX_BYTES);
    setProblem(tooBig.length ? `${tooBig.map((f) => f.name).join(', ')}: larger than 8 MB. Take it at a lower resolution.` : null);
    const ok = files.filter((f) => f.size <= DEFAULT_UPLOAD_MAX_BYTES);
    if (!ok.length) return;
    await attachPhotos(changeId, ok);
    setNames((n) => [...n, ...ok.map((f) => f.name)]);
  };
  return (
    <section aria-labelledby="queued-photos" className="flex flex-col gap-2">
      <h3 id="queued-photos" className="text-lg font-bold">Photo of the defect</h3>
      <p>Taken now, it waits on this device with the check-in and goes to the defect once the check-in has been sent.</p>
      <Button className="min-h-14 self-start px-8 text-lg" onClick={() => camera.current?.click()}>
        <span aria-hidden>＋</span> Add a photo
      </Button>
      <input ref={camera} type="file" accept={ACCEPT_ATTRIBUTE} capture="environment" multiple className="sr-only" tabIndex={-1} aria-hidden onChange={(e) => void onChange(e)} />
      {names.length > 0 && (
        <p role="status">
          <span aria-hidden>◌ </span>{names.length === 1 ? 'One photo waits' : `${names.length} photos wait`} with the check-in: {names.join(', ')}.
        </p>
      )}
      {problem && <p role="alert" className="text-state-stop">⚠ {problem}</p>}
    </section>
  );
}

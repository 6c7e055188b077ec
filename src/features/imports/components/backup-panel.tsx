import { useState, type ChangeEvent } from 'react';
import { Button } from '../../../components/ui/button';
import { ErrorPanel } from '../../../components/ui/states';
import { RESTORE_MAX_BYTES, type RestoreFiles } from '../../../../shared/schemas/imports';
import { backupHref, useRestore } from '../api';
import { ProgressBar } from './progress-bar';

const REPLACED = [
  'sites, people and their passwords',
  'models, service plans and reading limits',
  'the fleet, odometer readings and service records',
  'tasks, valve readings and shim stock',
  'defects, the mail outbox and the audit log',
  'photos, their previews and documents',
];

const MB = 1024 * 1024;
const size = (bytes: number) =>
  bytes >= 1024 * MB ? `${(bytes / 1024 / MB).toFixed(1)} GB` : bytes > MB ? `${(bytes / MB).toFixed(1)} MB` : `${Math.ceil(bytes / 1024)} KB`;
const count = (n: number, one: string, many: string) => `${n.toLocaleString('en-GB')} ${n === 1 ? one : many}`;

/** What the restore did with the photos, previews and documents, in a sentence or two. */
function FilesReport({ files }: { files: RestoreFiles }) {
  if (!files.included)
    return (
      <p className="mt-2">
        Photos and documents were not in this backup: it was made by an older Lashline and holds the database only. The restored records name{' '}
        {count(files.named, 'file', 'files')}
        {files.missing ? `; ${count(files.missing, 'is', 'are')} not on this server and will not open.` : ', and this server holds all of them.'}
      </p>
    );
  return (
    <p className="mt-2">
      Photos and documents: {count(files.restored, 'file', 'files')} ({size(files.bytes)}) restored
      {files.alreadyStored ? `, ${files.alreadyStored.toLocaleString('en-GB')} of them already stored here unchanged` : ''}.
      {files.missing ? ` ${count(files.missing, 'file was', 'files were')} already missing when the backup was made.` : ''}
    </p>
  );
}

/** Download a full backup of the database, or put one back in place of everything. */
export function BackupPanel() {
  const [file, setFile] = useState<File | null>(null);
  const [sent, setSent] = useState(0);
  // A new key clears the file input when the restore is called off.
  const [inputKey, setInputKey] = useState(0);
  const restore = useRestore();
  const choose = (e: ChangeEvent<HTMLInputElement>) => {
    restore.reset();
    setFile(e.target.files?.[0] ?? null);
  };
  const tooBig = !!file && file.size > RESTORE_MAX_BYTES;
  return (
    <section aria-labelledby="backup-title" className="flex flex-col gap-5 rounded-card border-2 border-ink-line bg-paper-raised p-5">
      <h2 id="backup-title" className="text-xl font-bold">Backup and restore</h2>
      <div className="flex flex-col gap-2">
        <h3 className="font-semibold">Download a backup</h3>
        <p className="text-ink-soft">
          One file holding the whole database and every photo and document (with their previews), each checked by its own checksum when it is restored. It
          holds people’s password hashes: keep it where only administrators can reach it.
        </p>
        <div className="flex flex-wrap gap-2">
          <a href={backupHref()} download className="inline-flex min-h-tap items-center rounded-card bg-accent px-4 font-semibold text-white hover:bg-accent-strong">Download a backup</a>
          <a href={backupHref('json')} download className="inline-flex min-h-tap items-center rounded-card border-2 border-ink-line px-4 font-semibold">Download as JSON</a>
        </div>
        <p className="text-sm text-ink-muted">
          Both hold the same photos and documents. The first keeps the database in its own format; with JSON it also restores on a server that runs PostgreSQL.
        </p>
      </div>

      <div className="flex flex-col gap-3 border-t-2 border-ink-line pt-4">
        <h3 className="font-semibold">Restore from a backup</h3>
        <label className="flex flex-col gap-1">
          <span>Backup file (.tar.gz, or .json from an older Lashline)</span>
          <input key={inputKey} type="file" accept=".gz,.tgz,.json,application/gzip,application/json" onChange={choose} disabled={restore.isPending} className="min-h-tap rounded-card border-2 border-ink-line bg-paper p-2" />
        </label>
        {tooBig && <p role="alert" className="font-semibold text-state-stop">⚠ The file is larger than {size(RESTORE_MAX_BYTES)}.</p>}
        {file && !tooBig && !restore.data && (
          <div role="alertdialog" aria-labelledby="restore-confirm" className="rounded-card border-2 border-state-stop bg-state-stop-soft p-4">
            <p id="restore-confirm" className="font-semibold">
              Replace all of Lashline’s data with {file.name} ({size(file.size)})?
            </p>
            <p className="mt-1">Everything now in the database is replaced by what the backup holds:</p>
            <ul className="ml-5 list-disc">{REPLACED.map((r) => <li key={r}>{r}</li>)}</ul>
            <p className="mt-1">
              The backup is checked in full first. Work recorded since it was made is lost, with photos and documents added since. Everyone is signed out, you
              too. If the file does not fit, nothing changes.
            </p>
            <div className="mt-3 flex flex-wrap gap-2">
              <Button kind="danger" disabled={restore.isPending} onClick={() => restore.mutate({ file, onProgress: setSent })}>
                Replace everything with this backup
              </Button>
              <Button kind="secondary" disabled={restore.isPending} onClick={() => { setFile(null); setInputKey((k) => k + 1); }}>Keep the data as it is</Button>
            </div>
          </div>
        )}
        {restore.isPending && <ProgressBar label={sent < 1 ? 'Sending the backup' : 'Checking the backup and replacing the data'} value={sent} />}
        {restore.error && <ErrorPanel error={restore.error} />}
        {restore.data && (
          <div role="status" className="rounded-card border-2 border-state-ok bg-state-ok-soft p-4">
            <p className="font-semibold"><span aria-hidden>✓ </span>Restored. Rows now in each table:</p>
            <ul className="num mt-2 grid gap-x-6 sm:grid-cols-3">
              {restore.data.tables.map((t) => <li key={t.name}>{t.name}: {t.rows.toLocaleString('en-GB')}</li>)}
            </ul>
            <FilesReport files={restore.data.files} />
            {restore.data.files.removed > 0 && (
              <p className="mt-1">{count(restore.data.files.removed, 'file', 'files')} that only the replaced records named were removed from storage.</p>
            )}
            <p className="mt-2">Everyone has been signed out.</p>
            <Button className="mt-3" onClick={() => window.location.assign('/sign-in')}>Sign in again</Button>
          </div>
        )}
      </div>
    </section>
  );
}

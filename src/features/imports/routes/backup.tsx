import { PageHeader } from '../../../components/ui/states';
import { BackupPanel } from '../components/backup-panel';

/** The administrator's page for a full backup and a restore. */
export function BackupRoute() {
  return (
    <>
      <PageHeader title="Backup" />
      <BackupPanel />
    </>
  );
}

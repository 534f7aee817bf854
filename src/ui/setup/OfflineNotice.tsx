import type { SyncView } from '../../app/app-state';

/** Set-up changes go straight to the site server: say so plainly when there is no connection. */
export function OfflineNotice({ sync }: { sync: SyncView }) {
  if (sync.state !== 'offline') return null;
  return (
    <p class="caution" role="status" data-testid="setup-offline">
      <strong>No connection.</strong> Set-up changes are saved on the site server, not on this tablet, so they need a connection.
      You can keep filling in the form; it stays here until you save it once the tablet is connected again.
    </p>
  );
}

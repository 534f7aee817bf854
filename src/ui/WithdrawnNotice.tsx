import type { AppState } from '../app/app-state';

/**
 * Shown on a tablet an administrator has withdrawn: what that means, and that nothing unsent is lost. It goes by
 * itself after the first sync that works again (an admin reinstated the tablet): the state comes from the last run.
 */
export function WithdrawnNotice({ state }: { state: AppState }) {
  if (!state.sync.withdrawn) return null;
  const n = state.sync.pending;
  return (
    <div class="caution withdrawn-notice" role="alert" data-testid="withdrawn-notice">
      <strong>This tablet has been withdrawn from the site by an administrator.</strong> It can no longer send records or receive
      updates.{' '}
      {n > 0
        ? `${n} record${n === 1 ? '' : 's'} saved here ${n === 1 ? 'has' : 'have'} not reached the server: ${n === 1 ? 'it stays' : 'they stay'} on this tablet and on its charts. If it was withdrawn by mistake, ask the site admin to reinstate it: ${n === 1 ? 'it is' : 'they are'} then sent at its next sync. Do not reset the tablet or connect it again before that, or ${n === 1 ? 'it' : 'they'} will never reach the server.`
        : 'Everything recorded here had reached the server.'}
    </div>
  );
}

import { useState } from 'preact/hooks';
import type { AppActions, AppState } from '../../app/app-state';
import { CauseList, DEFAULT_CAUSE_CATEGORIES } from '../../schema';
import { ListEditor } from './ListEditor';

/** The site's cause categories: offered in the signal prompt wherever a characteristic keeps the site's list. */
export function SiteCausesEditor({ state, actions }: { state: AppState; actions: AppActions }) {
  const siteId = state.device?.siteId ?? state.setup.sites[0]?.id ?? '';
  const current = state.setup.causeLists.find((c) => c.siteId === siteId);
  const [items, setItems] = useState<string[]>(() => [...(current?.categories ?? DEFAULT_CAUSE_CATEGORIES)]);
  const [tried, setTried] = useState(false);
  const [busy, setBusy] = useState(false);
  const categories = items.map((s) => s.trim()).filter(Boolean);
  const parsed = CauseList.safeParse({ siteId, categories });
  const error = categories.length === 0 ? 'Keep at least one category.'
    : new Set(categories.map((c) => c.toLowerCase())).size !== categories.length ? 'Each category once.'
    : !parsed.success ? 'At most 60 characters per category.' : undefined;
  const save = async (e: Event) => {
    e.preventDefault();
    setTried(true);
    if (error || !parsed.success) return;
    setBusy(true);
    // One list per site, under the id the site's set-up uses for it ('<site>-causes').
    await actions.saveSetup([{ kind: 'causes', id: `${siteId}-causes`, body: parsed.data }], "The site's cause categories");
    setBusy(false);
  };
  return (
    <section class="card stack" aria-labelledby="site-causes-title">
      <h2 id="site-causes-title">Cause categories of the site</h2>
      <p class="hint">Offered when a rule fires, for every characteristic that uses the site's list. The usual six of a cause-and-effect diagram are the starting point.</p>
      <form class="stack" onSubmit={save} noValidate>
        <ListEditor idPrefix="site-cause" itemLabel="Category" items={items} addLabel="Add a category" onChange={(next) => { setItems(next); setTried(true); }}
          error={tried ? error : undefined} />
        <button type="submit" class="btn small" style="align-self:flex-start" disabled={busy} data-testid="save-site-causes">Save the site's categories</button>
      </form>
    </section>
  );
}

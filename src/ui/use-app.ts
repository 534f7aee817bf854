import { useEffect, useState } from 'preact/hooks';
import type { AppActions, AppState } from '../app/app-state';

/** The app as the screens see it: a state to read, a way to be told of changes, actions to call. */
export interface AppHandle {
  getState(): AppState;
  subscribe(listener: () => void): () => void;
  readonly actions: AppActions;
}

export function useAppState(app: AppHandle): AppState {
  const [state, setState] = useState(app.getState());
  useEffect(() => {
    const unsubscribe = app.subscribe(() => setState(app.getState()));
    // A change between the first render and this effect (which runs after paint) would otherwise be
    // missed: the app could sit on "Opening Plumbline…" although it had moved on.
    setState(app.getState());
    return unsubscribe;
  }, [app]);
  return state;
}

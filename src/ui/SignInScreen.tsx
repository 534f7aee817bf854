import { useState } from 'preact/hooks';
import type { AppActions, AppState } from '../app/app-state';
import { applyKey, Keypad, type KeypadKey } from './Keypad';

/** Who is at the machine: login, then PIN on the keypad. Works offline for people who signed in here before. */
export function SignInScreen({ state, actions }: { state: AppState; actions: AppActions }) {
  const [login, setLogin] = useState('');
  const [pin, setPin] = useState('');
  const [busy, setBusy] = useState(false);
  const submit = async () => {
    if (!login.trim() || pin.length < 4) return;
    setBusy(true);
    const ok = await actions.signIn(login.trim(), pin);
    setBusy(false);
    if (!ok) setPin('');
  };
  const onKey = (k: KeypadKey) => {
    if (k === 'next') void submit();
    else if (k !== 'sep' && k !== 'minus') setPin((p) => (k === 'back' ? p.slice(0, -1) : applyKey(p, k, '.').slice(0, 12)));
  };
  return (
    <main class="main">
      <form class="card stack centre-panel" onSubmit={(e) => { e.preventDefault(); void submit(); }} aria-labelledby="signin-title">
        <h1 id="signin-title">Who is at the machine?</h1>
        {state.signedIn.length ? (
          <div class="stack">
            <span class="hint">Signed in on this tablet before — tap your name, then enter your PIN:</span>
            <div class="person-grid">
              {state.signedIn.map((p) => (
                <button type="button" class={`btn${p.login === login ? ' primary' : ''}`} key={p.id} aria-pressed={p.login === login}
                  onClick={() => { setLogin(p.login); setPin(''); }}>{p.name}</button>
              ))}
            </div>
          </div>
        ) : null}
        <label class="stack" style="gap:6px">
          <span>Login</span>
          <input class="text-input" name="login" autocomplete="username" autocapitalize="none" value={login}
            onInput={(e) => setLogin((e.target as HTMLInputElement).value)} />
        </label>
        <label class="stack" style="gap:6px">
          <span>PIN</span>
          <input class="text-input" name="pin" type="password" inputMode="numeric" autocomplete="current-password" value={pin}
            onInput={(e) => setPin((e.target as HTMLInputElement).value.replace(/\D/g, '').slice(0, 12))} />
        </label>
        <Keypad pin separator="." allowDecimal={false} allowMinus={false} onKey={onKey} nextLabel={busy ? 'Checking…' : 'Sign in'} />
        {state.error ? <p class="error-text" role="alert">{state.error}</p> : null}
      </form>
    </main>
  );
}

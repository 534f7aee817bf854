import { SetupRecord, describeIssues, pinRefOf, type Acknowledgement, type DeviceRecord, type Person, type Response, type Sample } from '../schema';
import {
  getAcksForCharacteristic,
  getSamplesForCharacteristic,
  resolveCorrections,
  getDeviceIdentity,
  getResponsesForCharacteristic,
  getSetup,
  listSignedInPeople,
  resetSendingOnStart,
  listOutboxProblems,
  removeSignedInPerson,
  saveDeviceRecord,
  saveImportedSamples,
  saveSignedInPerson,
  getSignedInPerson,
  setDeviceIdentity,
  type AppDb,
  type DeviceIdentity,
  type SignedInPerson,
} from '../store';
import type { AdminApi } from '../sync/admin-api';
import { ApiError, type ApiClient } from '../sync/api-client';
import { verifyOffline } from '../sync/offline-verifier';
import type { SyncStatus } from '../sync/sync-engine';
import {
  EMPTY_SETUP,
  type AnswerInput,
  type AppActions,
  type AppState,
  type CharacteristicView,
  type EntryInput,
  type ImportOutcome,
  type Screen,
  type SignalPrompt,
  type SyncView,
} from './app-state';
import { createAdminController } from './admin-controller';
import { compareSamples } from './analysis-input';
import { buildCharacteristicView } from './build-view';
import { entryProblem } from './entry-check';
import { signalsAt } from './signal-state';
import { snapshotSignals } from './snapshots';

/** The sync engine as the app uses it. */
export interface SyncPort {
  syncNow(options?: { ignoreBackoff?: boolean }): Promise<unknown>;
  start(): void;
  stop(): void;
  getStatus(): SyncStatus;
  subscribe(listener: (status: SyncStatus) => void): () => void;
}

/** A key-value place for what survives a reload of the tab but not much more (sessionStorage in the browser). */
export interface SmallStorage {
  getItem(key: string): string | null;
  setItem(key: string, value: string): void;
  removeItem(key: string): void;
}

export interface AppDeps {
  readonly db: AppDb;
  readonly api: ApiClient;
  /** Made once the device is known (the engine needs the device token). */
  readonly createSync: (identity: DeviceIdentity) => SyncPort;
  readonly now: () => number;
  readonly newId: () => string;
  readonly session: SmallStorage;
  readonly prefs: SmallStorage;
  /** Storage persistence and space (navigator.storage); absent in tests that do not need it. */
  readonly storage?: {
    persist(): Promise<boolean | null>;
    estimate(): Promise<{ usage: number; quota: number; isNearlyFull: boolean } | null>;
  };
  /** Tells the app's other tabs on this tablet about records written here (BroadcastChannel in the browser). */
  readonly channel?: Pick<BroadcastChannel, 'postMessage' | 'addEventListener'>;
  /** Background Sync registration (Chromium): a wake-up call for the sender; optional everywhere. */
  readonly requestBackgroundSync?: () => void;
  /** The theme before the person chooses one (e.g. from prefers-color-scheme). */
  readonly defaultTheme?: 'light' | 'dark';
  /** The site admin's calls (people, tablets, enrolment codes); absent, the admin screens say so. */
  readonly adminApi?: AdminApi;
}

/** Where a person's server session token is kept for the tab (set-up changes and the admin calls need it). */
const sessionKey = (personId: string) => `plumbline.session.${personId}`;

const SUPERVISING: readonly Person['role'][] = ['supervisor', 'engineer', 'admin'];
const ENGINEERING: readonly Person['role'][] = ['engineer', 'admin'];
/** Imported samples saved per transaction: big enough to be quick, small enough to keep the screen painting. */
const IMPORT_BATCH = 500;

function toPerson(p: SignedInPerson): Person {
  return { id: p.personId, name: p.name, login: p.login, role: p.role, active: true };
}

function syncView(s: SyncStatus): SyncView {
  return {
    state: s.state,
    pending: s.pending,
    rejected: s.rejected,
    ...(s.lastSuccessAt ? { lastSuccessAt: new Date(s.lastSuccessAt).toISOString() } : {}),
    ...(s.lastError ? { lastError: s.lastError } : {}),
    ...(s.progress ? { progress: s.progress } : {}),
    ...(s.clockOffsetMs !== null ? { clockOffsetMs: s.clockOffsetMs, clockSkewed: s.isClockSkewed } : {}),
    ...(s.lastErrorCode === 'device-revoked' ? { withdrawn: true } : {}),
  };
}


function messageOf(e: unknown): string {
  return e instanceof Error ? e.message : String(e);
}

/**
 * The app: state plus the actions the screens call. It joins the device store, the engine
 * and the sync engine; the UI only reads state and calls actions.
 */
export function createPlumblineApp(deps: AppDeps) {
  const { db, api } = deps;
  let state: AppState = {
    stage: 'starting', signedIn: [], setup: EMPTY_SETUP, screen: { name: 'board' }, views: {},
    sync: { state: 'idle', pending: 0, rejected: 0 }, now: deps.now(),
    persisted: null,
    theme: (deps.prefs.getItem('plumbline.theme') ?? deps.defaultTheme ?? 'light') === 'dark' ? 'dark' : 'light',
  };
  const listeners = new Set<() => void>();
  let identity: DeviceIdentity | undefined;
  let sync: SyncPort | undefined;
  let unsubscribeSync: (() => void) | undefined;
  let pulledThisRun = 0;
  let toastTimer: ReturnType<typeof setTimeout> | undefined;

  const set = (patch: Partial<AppState>) => {
    state = { ...state, ...patch };
    for (const l of listeners) l();
  };
  /** After a save: try to send now, and ask the browser to wake us for it later if we are offline. */
  const sendSoon = () => {
    void sync?.syncNow();
    deps.requestBackgroundSync?.();
  };
  const scheduleToastEnd = () => {
    clearTimeout(toastTimer);
    toastTimer = setTimeout(() => set({ toast: undefined }), 4000);
  };
  const toast = (text: string) => {
    set({ toast: text });
    scheduleToastEnd();
  };

  /**
   * The records behind each characteristic, read from IndexedDB once and then kept in step in
   * memory: a save appends to it, so the chart redraws without re-reading thousands of samples.
   * It is emptied when a sync run brings other tablets' records or set-up, when another tab of the
   * app says it wrote (BroadcastChannel), and when a person signs in.
   */
  const records = new Map<string, { samples: Sample[]; responses: Response[]; acks: Acknowledgement[] }>();

  async function recordsOf(characteristicId: string) {
    let r = records.get(characteristicId);
    if (!r) {
      const [samples, responses, acks] = await Promise.all([
        getSamplesForCharacteristic(db, characteristicId),
        getResponsesForCharacteristic(db, characteristicId),
        getAcksForCharacteristic(db, characteristicId),
      ]);
      r = { samples, responses, acks };
      records.set(characteristicId, r);
    }
    return r;
  }

  /** Keeps the in-memory copy in step with a record that has just been committed to IndexedDB. */
  function remember(record: DeviceRecord) {
    const r = records.get(record.characteristicId);
    if (!r) return;
    if (record.kind === 'sample') {
      const last = r.samples[r.samples.length - 1];
      r.samples.push(record);
      if (last && compareSamples(last, record) > 0) r.samples.sort(compareSamples);
    } else if (record.kind === 'response') r.responses.push(record);
    else r.acks.push(record);
  }

  /**
   * Other tabs of the app on this tablet keep their own in-memory copies: tell them what changed
   * (BroadcastChannel), and drop ours when they tell us.
   */
  function announce(what: readonly string[] | 'all') {
    deps.channel?.postMessage(what);
  }
  deps.channel?.addEventListener('message', (e: MessageEvent) => {
    const what = e.data as readonly string[] | 'all';
    if (what === 'all') records.clear();
    else if (Array.isArray(what)) for (const id of what) records.delete(id);
    if (state.stage === 'ready') void refreshViews(what === 'all' ? undefined : what.filter((id) => id in state.views));
  });

  /**
   * Saves a record made here (with its outbox row), keeps the in-memory copy in step and tells the
   * other tabs. On failure the error says what was NOT saved, and false comes back.
   */
  async function commit(record: DeviceRecord, what: string): Promise<boolean> {
    try {
      await saveDeviceRecord(db, record, deps.now());
    } catch (e) {
      set({ error: `The ${what} was NOT saved: ${messageOf(e)}` });
      return false;
    }
    remember(record);
    announce([record.characteristicId]);
    return true;
  }

  /** Takes back a record whose write failed. */
  function forget(record: DeviceRecord) {
    const r = records.get(record.characteristicId);
    if (!r) return;
    if (record.kind === 'sample') r.samples = r.samples.filter((s) => s.id !== record.id);
    else if (record.kind === 'response') r.responses = r.responses.filter((s) => s.id !== record.id);
    else r.acks = r.acks.filter((s) => s.id !== record.id);
  }

  async function loadView(characteristicId: string): Promise<CharacteristicView | undefined> {
    const ch = state.setup.characteristics.find((c) => c.id === characteristicId);
    if (!ch) return undefined;
    const r = await recordsOf(ch.id);
    return buildCharacteristicView(ch, state.setup.phases, resolveCorrections(r.samples), r.responses, r.acks, deps.now());
  }

  async function refreshViews(ids?: readonly string[]) {
    const targets = ids ?? state.setup.characteristics.filter((c) => c.stationId === state.stationId).map((c) => c.id);
    const views = { ...state.views };
    for (const id of targets) {
      const v = await loadView(id);
      if (v) views[id] = v;
    }
    set({ views, now: deps.now() });
  }

  async function reloadSetup() {
    const setup = await getSetup(db);
    let stationId = state.stationId ?? deps.prefs.getItem('plumbline.station') ?? undefined;
    if (!stationId || !setup.stations.some((s) => s.id === stationId)) stationId = setup.stations[0]?.id;
    set({ setup, ...(stationId ? { stationId } : {}) });
  }

  function startSync(id: DeviceIdentity) {
    sync?.stop();
    unsubscribeSync?.();
    sync = deps.createSync(id);
    unsubscribeSync = sync.subscribe((s) => {
      const wasSyncing = state.sync.state === 'syncing';
      set({ sync: syncView(s) });
      // Fresh data came down (set-up, or other tablets' records): re-read set-up and charts once the
      // run ends. A run that only sent (or failed) leaves the in-memory records as they are.
      if (s.state === 'syncing' && s.progress) pulledThisRun = Math.max(pulledThisRun, s.progress.pulled);
      if (wasSyncing && s.state !== 'syncing') {
        const pulled = Math.max(pulledThisRun, s.progress?.pulled ?? 0);
        pulledThisRun = 0;
        if (pulled > 0) {
          records.clear();
          announce('all');
          void reloadSetup().then(() => forgetWithdrawnPeople()).then(() => refreshViews());
        }
      }
    });
    set({ sync: syncView(sync.getStatus()) });
    sync.start();
  }

  /**
   * People the site has withdrawn (active false in the pulled set-up) lose their offline sign-in on this
   * tablet, and are signed out if they are the one signed in now.
   */
  async function forgetWithdrawnPeople() {
    const withdrawn = new Set(state.setup.people.filter((p) => !p.active).map((p) => p.id));
    const cached = await listSignedInPeople(db);
    const gone = cached.filter((p) => withdrawn.has(p.personId));
    if (gone.length === 0) return;
    for (const p of gone) {
      await removeSignedInPerson(db, p.login);
      deps.session.removeItem(sessionKey(p.personId));
    }
    const signedIn = cached.filter((p) => !withdrawn.has(p.personId)).map(toPerson);
    if (state.person && withdrawn.has(state.person.id)) {
      deps.session.removeItem('plumbline.person');
      set({
        signedIn, stage: 'sign-in', person: undefined, prompt: undefined, admin: undefined,
        error: `${state.person.name}'s access to this site has been withdrawn by an administrator, so they have been signed out.`,
      });
    } else set({ signedIn });
  }

  /** The person as the pulled set-up has them now (role changes reach offline sign-ins too). */
  function currentPerson(known: SignedInPerson): Person {
    const p = state.setup.people.find((x) => x.id === known.personId);
    return p ? { ...p } : toPerson(known);
  }

  async function becomeReady(person: Person) {
    deps.session.setItem('plumbline.person', person.id);
    records.clear(); // a new person starts from what IndexedDB holds now
    const signedIn = (await listSignedInPeople(db)).map(toPerson);
    set({ stage: 'ready', person, signedIn, error: undefined, screen: { name: 'board' } });
    await refreshViews();
  }

  /** Asks the browser to keep this site's data (sync.md §2.5) and warns when space runs short (§2.6). */
  async function checkStorage() {
    if (!deps.storage) return;
    const persisted = await deps.storage.persist().catch(() => null);
    const estimate = await deps.storage.estimate().catch(() => null);
    set({ persisted });
    if (estimate?.isNearlyFull) {
      set({ error: `Storage on this tablet is nearly full (${Math.round((estimate.usage / estimate.quota) * 100)}% used). Sync now; new readings may not fit.` });
    }
  }

  async function start() {
    try {
      await resetSendingOnStart(db);
      void checkStorage();
      identity = await getDeviceIdentity(db);
      if (!identity) return set({ stage: 'enrol' });
      set({ device: { deviceId: identity.deviceId, deviceName: identity.deviceName, siteId: identity.siteId } });
      await reloadSetup();
      startSync(identity);
      await forgetWithdrawnPeople();
      const people = await listSignedInPeople(db);
      const current = people.find((p) => p.personId === deps.session.getItem('plumbline.person'));
      set({ signedIn: people.map(toPerson) });
      if (current) await becomeReady(currentPerson(current));
      else set({ stage: 'sign-in' });
    } catch (e) {
      set({ stage: 'failed', error: `Plumbline could not open its storage on this tablet: ${messageOf(e)}` });
    }
  }

  const admin = createAdminController({
    api: deps.adminApi,
    sessionToken: () => (state.person ? (deps.session.getItem(sessionKey(state.person.id)) ?? undefined) : undefined),
    get: () => state.admin,
    set: (view) => set({ admin: view }),
    now: deps.now,
    onPersonChanged(person) {
      // An admin who changed themself now has the role the server gave them, or is signed out.
      if (state.person?.id !== person.id) return true;
      if (!person.active) {
        actions.signOut();
        set({ error: 'You have withdrawn your own access to this site, so you have been signed out.' });
        return false;
      }
      if (person.role === 'admin') return true;
      set({ person, screen: { name: 'board' }, admin: undefined });
      toast(`You are now ${person.role === 'engineer' ? 'an' : 'a'} ${person.role} at this site`);
      return false;
    },
  });

  const actions: AppActions = {
    ...admin,
    async enrol(code, deviceName) {
      try {
        const res = await api.enrolDevice({ code, deviceName });
        identity = { deviceId: res.deviceId, deviceToken: res.deviceToken, siteId: res.siteId, deviceName };
        await setDeviceIdentity(db, identity);
        set({ device: { deviceId: res.deviceId, deviceName, siteId: res.siteId }, stage: 'sign-in', error: undefined });
        startSync(identity);
        await sync?.syncNow();
        await reloadSetup();
        return true;
      } catch (e) {
        const offline = e instanceof ApiError && e.code === 'offline';
        set({ error: offline ? 'The site server cannot be reached. Connecting a tablet needs the network once.' : messageOf(e) });
        return false;
      }
    },

    async signIn(login, pin) {
      if (!identity) return false;
      try {
        const res = await api.signIn(identity.deviceToken, { login, pin });
        await saveSignedInPerson(db, {
          personId: res.person.id, login: res.person.login, name: res.person.name, role: res.person.role,
          offlineVerifier: res.offlineVerifier, signedInAt: deps.now(),
        });
        deps.session.setItem(sessionKey(res.person.id), res.sessionToken);
        await becomeReady(res.person);
        return true;
      } catch (e) {
        const noServer = e instanceof ApiError && (e.code === 'offline' || e.code === 'server' || e.code === 'bad-response');
        // A withdrawn tablet still lets people who signed in here before in, so that what it holds stays in view.
        const withdrawnTablet = e instanceof ApiError && e.details.serverCode === 'device-revoked';
        if (noServer || withdrawnTablet) {
          // No server: people who signed in on this tablet before can sign in against their cached verifier,
          // unless the set-up pulled since says the site has withdrawn their access.
          const wanted = login.trim().toLowerCase();
          const inSetup = state.setup.people.find((p) => p.login.toLowerCase() === wanted && p.active)
            ?? state.setup.people.find((p) => p.login.toLowerCase() === wanted);
          if (inSetup && !inSetup.active) {
            set({ error: `This person is no longer active on this site: ${inSetup.name}'s access has been withdrawn by an administrator.` });
            return false;
          }
          const known = await getSignedInPerson(db, login);
          if (known && inSetup?.pinRef && inSetup.id === known.personId && (await pinRefOf(known.offlineVerifier.salt)) !== inSetup.pinRef) {
            // The site admin has set a new PIN since this person last signed in here online.
            set({ error: `${inSetup.name}'s PIN has been changed by the site admin. Sign in once while the tablet is online, with the new PIN.` });
            return false;
          }
          if (known && (await verifyOffline(pin, known.offlineVerifier))) {
            await becomeReady(currentPerson(known));
            return true;
          }
          if (withdrawnTablet && !known) {
            set({ error: messageOf(e) });
            return false;
          }
          set({ error: known ? 'Login or PIN is not right.' : 'The server cannot be reached, and this person has not signed in on this tablet before.' });
          return false;
        }
        // Only the sign-in refusal means a wrong login or PIN; a withdrawn person gets the server's own words.
        const wrongPin = e instanceof ApiError && e.code === 'unauthorized' && (e.details.serverCode ?? 'sign-in-failed') === 'sign-in-failed';
        set({ error: wrongPin ? 'Login or PIN is not right.' : e instanceof ApiError && e.serverMessage ? e.serverMessage : messageOf(e) });
        return false;
      }
    },

    signOut() {
      deps.session.removeItem('plumbline.person');
      // The server session ends with the sign-out here: the next person at the tablet cannot act on it.
      if (state.person) deps.session.removeItem(sessionKey(state.person.id));
      set({ stage: 'sign-in', person: undefined, prompt: undefined, error: undefined, admin: undefined });
    },
    addPerson() {
      set({ stage: 'sign-in', error: undefined });
    },
    selectStation(stationId) {
      deps.prefs.setItem('plumbline.station', stationId);
      set({ stationId, screen: { name: 'board' } });
      void refreshViews();
    },
    open(screen: Screen) {
      set({ screen, error: undefined });
      if (screen.name === 'characteristic' || screen.name === 'new-phase' || screen.name === 'limits-history' || screen.name === 'edit-phase' || screen.name === 'import' || screen.name === 'report') void refreshViews([screen.characteristicId]);
      else if (screen.name === 'overview' || screen.name === 'handover') void refreshViews(state.setup.characteristics.map((c) => c.id));
      else if (screen.name === 'admin') {
        if (state.person?.role !== 'admin') return set({ screen: { name: 'board' }, error: 'Only a site admin can manage people and tablets.' });
        void admin.adminReload(); // online only: always what the server says now
      }
      else void refreshViews();
    },

    async record(characteristicId, entry: EntryInput) {
      const ch = state.setup.characteristics.find((c) => c.id === characteristicId);
      if (!ch || !identity || !state.person) return false;
      const problem = entryProblem(ch, entry);
      if (problem) {
        set({ error: `The sample was NOT saved: ${problem}` });
        return false;
      }
      const sample: Sample = {
        kind: 'sample', id: deps.newId(), characteristicId, takenAt: new Date(deps.now()).toISOString(),
        recordedBy: state.person.id, deviceId: identity.deviceId,
        ...(entry.values ? { values: [...entry.values] } : {}),
        ...(entry.count !== undefined ? { count: entry.count } : {}),
        ...(entry.inspected !== undefined ? { inspected: entry.inspected } : {}),
        ...(entry.lot ? { lot: entry.lot } : {}),
        ...(entry.comment ? { comment: entry.comment } : {}),
      };
      // The chart shows the new point at once, while the durable write to IndexedDB runs (a strict
      // commit waits for the disk: tens of ms). "Saved on this tablet" and the signal prompt come only
      // once the commit is done; if it fails, the point is taken back off the chart and the error says so.
      await recordsOf(characteristicId);
      remember(sample);
      const view = await loadView(characteristicId);
      performance.mark('plumbline:view-built');
      if (view) set({ views: { ...state.views, [characteristicId]: view }, error: undefined });
      try {
        await saveDeviceRecord(db, sample, deps.now());
        performance.mark('plumbline:sample-committed');
        announce([characteristicId]);
      } catch (e) {
        forget(sample);
        const back = await loadView(characteristicId);
        set({ ...(back ? { views: { ...state.views, [characteristicId]: back } } : {}), error: `The sample was NOT saved: ${messageOf(e)}` });
        return false;
      }
      const fired = view ? signalsAt(view.analysis, view.series.sampleIds.indexOf(sample.id)) : [];
      const prompt: SignalPrompt | undefined = fired.length ? { characteristicId, sampleId: sample.id, signals: fired } : undefined;
      set({ ...(prompt ? { prompt } : {}), toast: fired.length ? 'Saved on this tablet — a run rule fired' : 'Saved on this tablet' });
      scheduleToastEnd();
      // Send once the screen has painted.
      setTimeout(sendSoon, 0);
      return true;
    },

    async answer(prompt, answer: AnswerInput) {
      const view = state.views[prompt.characteristicId];
      if (!view || !identity || !state.person) return false;
      // The views may have been rebuilt since the prompt opened (a pull brought an earlier sample), which
      // shifts point indices: take the signals as they stand now at the same sample.
      const fired = view.groups.find((g) => g.sampleId === prompt.sampleId)?.signals ?? prompt.signals;
      const response: Response = {
        kind: 'response', id: deps.newId(), characteristicId: prompt.characteristicId, sampleId: prompt.sampleId,
        signals: snapshotSignals(fired, view.analysis, view.series),
        whatHappened: answer.whatHappened, causeCategory: answer.causeCategory, action: answer.action,
        ...(answer.cause ? { cause: answer.cause } : {}),
        respondedBy: state.person.id, respondedAt: new Date(deps.now()).toISOString(), deviceId: identity.deviceId,
      };
      if (!(await commit(response, 'answer'))) return false;
      set({ prompt: undefined });
      await refreshViews([prompt.characteristicId]);
      toast('Answer saved on this tablet');
      sendSoon();
      return true;
    },

    postpone() {
      set({ prompt: undefined });
      toast('The signal stays open until it is answered');
    },

    reopenPrompt(characteristicId, sampleId) {
      const view = state.views[characteristicId];
      const group = view?.groups.find((g) => g.sampleId === sampleId);
      if (group) set({ prompt: { characteristicId, sampleId, signals: group.signals } });
    },

    async acknowledge(characteristicId, responseId, note) {
      if (!identity || !state.person) return false;
      if (!SUPERVISING.includes(state.person.role)) {
        set({ error: 'Only a supervisor, engineer or admin can sign off a signal.' });
        return false;
      }
      const ack: Acknowledgement = {
        kind: 'ack', id: deps.newId(), responseId, characteristicId, by: state.person.id,
        at: new Date(deps.now()).toISOString(), deviceId: identity.deviceId, ...(note ? { note } : {}),
      };
      if (!(await commit(ack, 'sign-off'))) return false;
      await refreshViews([characteristicId]);
      sendSoon();
      return true;
    },

    async correct(characteristicId, sampleId, entry, reason) {
      const view = state.views[characteristicId];
      const original = view?.series.samples.find((s) => s.id === sampleId);
      if (!original || !identity || !state.person) return false;
      if (!reason.trim()) {
        set({ error: 'A correction needs a reason.' });
        return false;
      }
      if (original.excluded && !ENGINEERING.includes(state.person.role)) {
        set({ error: 'This point is left out of the limits: only a quality engineer (or admin) can correct it.' });
        return false;
      }
      const problem = entryProblem(view!.characteristic, {
        values: entry.values ?? original.values, count: entry.count ?? original.count, inspected: entry.inspected ?? original.inspected,
      });
      if (problem) {
        set({ error: `The correction was NOT saved: ${problem}` });
        return false;
      }
      return saveSupersedingSample(characteristicId, original, {
        ...(entry.values ? { values: [...entry.values] } : {}),
        ...(entry.count !== undefined ? { count: entry.count } : {}),
        ...(entry.inspected !== undefined ? { inspected: entry.inspected } : {}),
        reason: reason.trim(),
      }, 'correction');
    },

    async setExcluded(characteristicId, sampleId, excluded, reason) {
      const view = state.views[characteristicId];
      const original = view?.series.samples.find((s) => s.id === sampleId);
      if (!original || !identity || !state.person) return false;
      if (!ENGINEERING.includes(state.person.role)) {
        set({ error: 'Only a quality engineer (or admin) can leave a point out of the limit calculation.' });
        return false;
      }
      if (!reason.trim()) {
        set({ error: 'Leaving a point out of the limits needs a reason.' });
        return false;
      }
      return saveSupersedingSample(characteristicId, original, { excluded, reason: reason.trim() }, excluded ? 'exclusion' : 'inclusion');
    },

    async saveSetup(entries, what) {
      return sendSetup(entries, what);
    },

    async importSamples(characteristicId, samples, onProgress) {
      if (!identity || !state.person) return null;
      if (!ENGINEERING.includes(state.person.role)) {
        set({ error: 'Only a quality engineer (or admin) can import history.' });
        return null;
      }
      if (samples.some((s) => s.characteristicId !== characteristicId)) {
        set({ error: 'The import was NOT saved: some samples belong to another characteristic.' });
        return null;
      }
      let saved = 0;
      let alreadyHeld = 0;
      let failed = false;
      try {
        for (let i = 0; i < samples.length; i += IMPORT_BATCH) {
          const r = await saveImportedSamples(db, samples.slice(i, i + IMPORT_BATCH), deps.now());
          saved += r.saved;
          alreadyHeld += r.alreadyHeld;
          onProgress?.(Math.min(i + IMPORT_BATCH, samples.length), samples.length);
          // Let the screen paint between batches: a big file must not freeze it.
          await new Promise((resolve) => setTimeout(resolve, 0));
        }
      } catch (e) {
        failed = true;
        set({ error: `The import stopped: ${saved} sample${saved === 1 ? ' was' : 's were'} saved, the rest was NOT saved: ${messageOf(e)}` });
      }
      // The in-memory copy is read again from IndexedDB (a sort of thousands of appends would cost more).
      records.delete(characteristicId);
      announce([characteristicId]);
      await refreshViews([characteristicId]);
      if (saved > 0) sendSoon();
      const outcome: ImportOutcome = { saved, alreadyHeld };
      return failed && saved === 0 ? null : outcome;
    },

    setTheme(theme) {
      deps.prefs.setItem('plumbline.theme', theme);
      set({ theme });
    },

    async syncNow() {
      await sync?.syncNow({ ignoreBackoff: true });
      if (state.syncDetails) await actions.openSyncDetails();
    },
    async openSyncDetails() {
      const [problems, estimate] = await Promise.all([listOutboxProblems(db), deps.storage?.estimate() ?? Promise.resolve(null)]);
      set({
        syncDetails: {
          problems: problems.map((r) => ({ id: r.id, kind: r.kind, state: r.state, reason: r.lastError ?? '', deviceSeq: r.deviceSeq })),
          persisted: state.persisted,
          ...(estimate ? { usage: estimate.usage, quota: estimate.quota } : {}),
        },
      });
    },
    closeSyncDetails() {
      set({ syncDetails: undefined });
    },
    dismissToast() {
      set({ toast: undefined });
    },
  };

  /** See AppActions.saveSetup: checked here, sent to the server, then pulled back like any set-up. */
  async function sendSetup(entries: readonly SetupRecord[], what: string): Promise<boolean> {
    if (!identity || !state.person) return false;
    const notSent = `${what} was NOT saved`;
    if (!ENGINEERING.includes(state.person.role)) {
      set({ error: `${notSent}: only a quality engineer or an admin can change set-up.` });
      return false;
    }
    for (const entry of entries) {
      const parsed = SetupRecord.safeParse(entry);
      if (!parsed.success) {
        set({ error: `${notSent}: ${describeIssues(parsed.error)}` });
        return false;
      }
    }
    const session = deps.session.getItem(sessionKey(state.person.id));
    if (!session || !api.postSetup) {
      set({ error: `${notSent}: set-up changes need a sign-in made while connected to the site server. Sign in again with a connection; the form keeps what you typed.` });
      return false;
    }
    try {
      await api.postSetup(identity.deviceToken, session, entries);
    } catch (e) {
      const code = e instanceof ApiError ? e.code : undefined;
      if (code === 'offline' || code === 'server') {
        set({ error: `${notSent}: set-up changes need a connection to the site server, and it cannot be reached now. Nothing was sent; the form keeps what you typed — save again once connected.` });
      } else if (code === 'unauthorized') {
        set({ error: `${notSent}: ${messageOf(e)} Sign in again while connected; the form keeps what you typed.` });
      } else {
        set({ error: `${notSent}: ${messageOf(e)}` });
      }
      return false;
    }
    set({ error: undefined });
    // The server holds it now; pull it back so this tablet (and its chart) use the new set-up at once.
    await sync?.syncNow({ ignoreBackoff: true });
    await reloadSetup();
    const touched = new Set<string>();
    for (const e of entries) {
      if (e.kind === 'characteristic') touched.add(e.body.id);
      if (e.kind === 'phase') touched.add(e.body.characteristicId);
    }
    await refreshViews([...new Set([...touched, ...state.setup.characteristics.filter((c) => c.stationId === state.stationId).map((c) => c.id)])]);
    toast(`${what} saved on the site server`);
    return true;
  }

  /** Writes a new sample that takes `original`'s place (same time), carrying over what `patch` does not change. */
  async function saveSupersedingSample(characteristicId: string, original: Sample, patch: Partial<Sample>, what: string): Promise<boolean> {
    const { id: _oldId, recordedBy: _by, deviceId: _dev, supersedes: _sup, reason: _reason, ...kept } = original;
    const replacement: Sample = {
      ...kept,
      ...(patch.values ? { values: patch.values, count: undefined, inspected: undefined } : {}),
      ...patch,
      // Corrected values were typed here, not read from the file: the import note stays with the original.
      ...(patch.values || patch.count !== undefined || patch.inspected !== undefined ? { imported: undefined } : {}),
      kind: 'sample', id: deps.newId(), supersedes: original.id,
      recordedBy: state.person!.id, deviceId: identity!.deviceId,
    };
    for (const k of Object.keys(replacement) as (keyof Sample)[]) if (replacement[k] === undefined) delete replacement[k];
    if (!(await commit(replacement, what))) return false;
    await refreshViews([characteristicId]);
    toast(`The ${what} is saved on this tablet; the original stays in the record`);
    sendSoon();
    return true;
  }

  const tick = setInterval(() => {
    if (state.stage === 'ready') void refreshViews();
  }, 30_000);

  return {
    getState: () => state,
    subscribe(listener: () => void) {
      listeners.add(listener);
      return () => listeners.delete(listener);
    },
    actions,
    start,
    stop() {
      clearInterval(tick);
      clearTimeout(toastTimer);
      sync?.stop();
      unsubscribeSync?.();
    },
  };
}

export type PlumblineApp = ReturnType<typeof createPlumblineApp>;

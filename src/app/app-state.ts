import type { Analysis, Signal } from '../engine/types';
import type { Acknowledgement, CauseList, Characteristic, Line, Person, Phase, Response, Sample, SetupRecord, Site, Station } from '../schema';
import type { AdminActions, AdminView } from './admin-controller';
import type { ChartSeries } from './analysis-input';
import type { DueStatus } from './due-state';
import type { SignalGroup } from './signal-state';

/** The site's set-up as this tablet knows it (latest version of each entity). */
export interface SetupView {
  readonly sites: readonly Site[];
  readonly lines: readonly Line[];
  readonly stations: readonly Station[];
  readonly characteristics: readonly Characteristic[];
  readonly phases: readonly Phase[];
  readonly people: readonly Person[];
  readonly causeLists: readonly CauseList[];
}

export const EMPTY_SETUP: SetupView = { sites: [], lines: [], stations: [], characteristics: [], phases: [], people: [], causeLists: [] };

/** Everything the screens need to show one characteristic. */
export interface CharacteristicView {
  readonly characteristic: Characteristic;
  readonly series: ChartSeries;
  readonly analysis: Analysis;
  readonly groups: readonly SignalGroup[];
  readonly responses: readonly Response[];
  readonly acks: readonly Acknowledgement[];
  readonly due: DueStatus;
  readonly lastTakenAt?: string;
}

/** The sync state in the words the status pill uses. */
export interface SyncView {
  readonly state: 'idle' | 'syncing' | 'offline' | 'error';
  readonly pending: number;
  readonly rejected: number;
  readonly lastSuccessAt?: string;
  readonly lastError?: string;
  readonly progress?: { readonly pushed: number; readonly toPush: number; readonly pulled: number };
  /** Server clock minus tablet clock, once known; `clockSkewed` when it is beyond the tolerance. */
  readonly clockOffsetMs?: number;
  readonly clockSkewed?: boolean;
  /** An administrator withdrew this tablet: it can no longer send or receive; unsent records stay on it. */
  readonly withdrawn?: boolean;
}

/** What the sync details sheet shows besides the sync state. */
export interface SyncDetails {
  /** Records the server refused or found in conflict: kept on the tablet with the reason. */
  readonly problems: readonly { readonly id: string; readonly kind: string; readonly state: string; readonly reason: string; readonly deviceSeq: number }[];
  /** Whether the browser promised not to clear this site's storage (null: it cannot say). */
  readonly persisted: boolean | null;
  readonly usage?: number;
  readonly quota?: number;
}

/** A rule fired when a sample was saved: the operator is asked what happened. */
export interface SignalPrompt {
  readonly characteristicId: string;
  readonly sampleId: string;
  readonly signals: readonly Signal[];
}

export type Screen =
  | { readonly name: 'board' }
  | { readonly name: 'overview' }
  | { readonly name: 'handover' }
  | { readonly name: 'characteristic'; readonly characteristicId: string }
  /** Set-up (engineer, admin): lines, stations and their characteristics. */
  | { readonly name: 'setup' }
  /** The characteristic editor: an existing one, or a new one at a station. */
  | { readonly name: 'edit-characteristic'; readonly characteristicId?: string; readonly stationId?: string }
  /** A new phase; `fromSampleId` preselects the point it starts at (chosen on the chart). */
  | { readonly name: 'new-phase'; readonly characteristicId: string; readonly fromSampleId?: string }
  | { readonly name: 'limits-history'; readonly characteristicId: string }
  /** Correcting or withdrawing a phase already started (engineer, admin). */
  | { readonly name: 'edit-phase'; readonly characteristicId: string; readonly phaseId: string }
  /** The printable report of one characteristic (preview, then the browser's print). */
  | { readonly name: 'report'; readonly characteristicId: string }
  /** CSV import of a characteristic's history (engineer and admin only). */
  | { readonly name: 'import'; readonly characteristicId: string }
  /** The site admin's people and tablets (admins only, online only). */
  | { readonly name: 'admin'; readonly tab: 'people' | 'tablets' };

export interface AppState {
  readonly stage: 'starting' | 'enrol' | 'sign-in' | 'ready' | 'failed';
  readonly device?: { readonly deviceId: string; readonly deviceName: string; readonly siteId: string };
  readonly person?: Person;
  /** People signed in on this tablet (a shared tablet switches between them quickly). */
  readonly signedIn: readonly Person[];
  readonly setup: SetupView;
  readonly stationId?: string;
  readonly screen: Screen;
  readonly views: Readonly<Record<string, CharacteristicView>>;
  readonly sync: SyncView;
  readonly prompt?: SignalPrompt;
  readonly toast?: string;
  readonly error?: string;
  readonly now: number;
  readonly theme: 'light' | 'dark';
  /** Open while the sync details sheet is shown. */
  readonly syncDetails?: SyncDetails;
  /** Storage persistence as granted at start (null until asked or where unsupported). */
  readonly persisted: boolean | null;
  /** The admin screens' data while they are open. */
  readonly admin?: AdminView;
}

export interface EntryInput {
  readonly values?: readonly number[];
  readonly count?: number;
  readonly inspected?: number;
  readonly lot?: string;
  readonly comment?: string;
}

/** What an import wrote: new samples, and samples this tablet already held (imported before). */
export interface ImportOutcome {
  readonly saved: number;
  readonly alreadyHeld: number;
}

export interface AnswerInput {
  readonly whatHappened: string;
  readonly causeCategory: string;
  readonly cause?: string;
  readonly action: string;
}

/** What the screens can ask for. Each action reports failure through `state.error`/`toast`, never by throwing into the UI. */
export interface AppActions extends AdminActions {
  enrol(code: string, deviceName: string): Promise<boolean>;
  signIn(login: string, pin: string): Promise<boolean>;
  signOut(): void;
  addPerson(): void;
  selectStation(stationId: string): void;
  open(screen: Screen): void;
  record(characteristicId: string, entry: EntryInput): Promise<boolean>;
  answer(prompt: SignalPrompt, answer: AnswerInput): Promise<boolean>;
  postpone(): void;
  reopenPrompt(characteristicId: string, sampleId: string): void;
  acknowledge(characteristicId: string, responseId: string, note?: string): Promise<boolean>;
  /** A correction: a new sample that supersedes `sampleId`, with a reason. Nothing is overwritten. */
  correct(characteristicId: string, sampleId: string, entry: EntryInput, reason: string): Promise<boolean>;
  /** Leave a point out of (or back in) the limit calculation: engineer only, with a reason. */
  setExcluded(characteristicId: string, sampleId: string, excluded: boolean, reason: string): Promise<boolean>;
  /**
   * Sends set-up changes to the site server (engineer: lines, stations, characteristics, phases, causes;
   * admin: also people and the site). Needs a connection and a sign-in made online; `what` names the
   * change in messages. Once stored, the tablet pulls the new set-up.
   */
  saveSetup(entries: readonly SetupRecord[], what: string): Promise<boolean>;
  /**
   * Records checked import samples (engineer and admin only) in batches, each batch in one transaction with
   * its outbox rows; `onProgress` after each batch. Null when nothing could be saved (state.error says why).
   */
  importSamples(characteristicId: string, samples: readonly Sample[], onProgress?: (done: number, total: number) => void): Promise<ImportOutcome | null>;
  setTheme(theme: 'light' | 'dark'): void;
  syncNow(): Promise<void>;
  openSyncDetails(): Promise<void>;
  closeSyncDetails(): void;
  dismissToast(): void;
}

import { useEffect, useMemo } from 'preact/hooks';
import { decimalSeparatorFor } from '../app/number-entry';
import { AdminScreen } from './admin/AdminScreen';
import { CharacteristicScreen } from './CharacteristicScreen';
import { EnrolScreen } from './EnrolScreen';
import { SignalPromptSheet } from './SignalPromptSheet';
import { SignInScreen } from './SignInScreen';
import { HandoverScreen } from './HandoverScreen';
import { ImportScreen } from './import/ImportScreen';
import { SiteOverview } from './SiteOverview';
import { SyncSheet } from './SyncSheet';
import { StationBoard } from './StationBoard';
import { TopBar } from './TopBar';
import { CharacteristicEditor } from './setup/CharacteristicEditor';
import { LimitsHistoryScreen } from './setup/LimitsHistoryScreen';
import { PhaseScreen } from './setup/PhaseScreen';
import { PhaseChangeScreen } from './setup/PhaseChangeScreen';
import { ReportScreen } from './report/ReportScreen';
import { SetupScreen } from './setup/SetupScreen';
import { WithdrawnNotice } from './WithdrawnNotice';
import { useAppState, type AppHandle } from './use-app';

export function App({ app, locale }: { app: AppHandle; locale: string }) {
  const state = useAppState(app);
  const { actions } = app;
  const separator = useMemo(() => decimalSeparatorFor(locale), [locale]);
  useEffect(() => {
    document.documentElement.dataset.theme = state.theme;
  }, [state.theme]);
  const promptChar = state.prompt && state.setup.characteristics.find((c) => c.id === state.prompt!.characteristicId);
  const site = state.setup.causeLists.find((c) => c.siteId === state.device?.siteId);
  let body;
  if (state.stage === 'starting') body = <main class="main"><p class="hint">Opening Plumbline…</p></main>;
  else if (state.stage === 'failed') body = <main class="main"><p class="error-text" role="alert">{state.error}</p></main>;
  else if (state.stage === 'enrol') body = <EnrolScreen state={state} actions={actions} />;
  else if (state.stage === 'sign-in') body = <SignInScreen state={state} actions={actions} />;
  else if (state.screen.name === 'characteristic') body = <CharacteristicScreen state={state} actions={actions} characteristicId={state.screen.characteristicId} separator={separator} />;
  else if (state.screen.name === 'import') body = <ImportScreen state={state} actions={actions} characteristicId={state.screen.characteristicId} separator={separator} />;
  else if (state.screen.name === 'overview') body = <SiteOverview state={state} actions={actions} />;
  else if (state.screen.name === 'handover') body = <HandoverScreen state={state} actions={actions} />;
  else if (state.screen.name === 'setup') body = <SetupScreen state={state} actions={actions} />;
  else if (state.screen.name === 'edit-characteristic') {
    const { characteristicId, stationId } = state.screen;
    body = <CharacteristicEditor key={characteristicId ?? `new:${stationId ?? ''}`} state={state} actions={actions} characteristicId={characteristicId} stationId={stationId} />;
  } else if (state.screen.name === 'new-phase') {
    const { characteristicId, fromSampleId } = state.screen;
    body = <PhaseScreen key={`${characteristicId}:${fromSampleId ?? ''}`} state={state} actions={actions} characteristicId={characteristicId} fromSampleId={fromSampleId} />;
  } else if (state.screen.name === 'edit-phase') {
    const { characteristicId, phaseId } = state.screen;
    body = <PhaseChangeScreen key={phaseId} state={state} actions={actions} characteristicId={characteristicId} phaseId={phaseId} />;
  } else if (state.screen.name === 'limits-history') body = <LimitsHistoryScreen state={state} actions={actions} characteristicId={state.screen.characteristicId} />;
  else if (state.screen.name === 'report') body = <ReportScreen key={state.screen.characteristicId} state={state} actions={actions} characteristicId={state.screen.characteristicId} />;
  else if (state.screen.name === 'admin') body = <AdminScreen state={state} actions={actions} tab={state.screen.tab} />;
  else body = <StationBoard state={state} actions={actions} />;
  return (
    <div class="shell">
      <TopBar state={state} actions={actions} />
      <WithdrawnNotice state={state} />
      {state.stage === 'ready' && state.error ? <p class="caution" role="alert" style="margin:12px 20px 0">{state.error}</p> : null}
      {body}
      {state.stage === 'ready' && state.prompt && promptChar ? (
        <SignalPromptSheet prompt={state.prompt} characteristic={promptChar} siteCauses={site?.categories ?? []} actions={actions} />
      ) : null}
      {state.syncDetails ? <SyncSheet state={state} details={state.syncDetails} actions={actions} /> : null}
      {state.toast ? <div class="toast" role="status" onClick={() => actions.dismissToast()}>{state.toast}</div> : null}
    </div>
  );
}

import { useEffect, useMemo, useState } from 'preact/hooks';
import type { AppActions, AppState, ImportOutcome } from '../../app/app-state';
import { guessDecimal, samplesToImport, summarizeImport, typoGuardOf, type ImportContext } from '../../app/import-check';
import { signalsAtImported } from '../../app/import-signals';
import { exportNotes, guessMapping, mappingProblems, mapRows, valuesPerSubgroup, type ColumnMapping } from '../../app/import-mapping';
import { readCsvTable, type CsvDelimiter } from '../../app/import-table';
import type { DateOrder } from '../../app/import-time';
import { isVariableChart } from '../../schema';
import { ColumnMappingPanel } from './ColumnMappingPanel';
import { ImportPreview } from './ImportPreview';
import { ImportSource } from './ImportSource';
import { DELIMITER_NAMES, ReadingOptions } from './ReadingOptions';
import { SafetyCaution } from '../SafetyCaution';
import { useCheckedRows } from './use-checked-rows';

/** CSV import of a characteristic's history: read, map, check, preview, and record only on confirmation. */
export function ImportScreen({ state, actions, characteristicId, separator }: {
  state: AppState; actions: AppActions; characteristicId: string; separator: ',' | '.';
}) {
  const ch = state.setup.characteristics.find((c) => c.id === characteristicId);
  const view = state.views[characteristicId];
  const [source, setSource] = useState<{ text: string; name: string } | null>(null);
  const [delimiter, setDelimiter] = useState<CsvDelimiter | 'auto'>('auto');
  const [mappingChoice, setMappingChoice] = useState<ColumnMapping | null>(null);
  const [decimalChoice, setDecimalChoice] = useState<',' | '.' | null>(null);
  const [dateOrder, setDateOrder] = useState<DateOrder>('dmy');
  const [includeFlagged, setIncludeFlagged] = useState(false);
  const [progress, setProgress] = useState<{ done: number; total: number } | null>(null);
  const [outcome, setOutcome] = useState<ImportOutcome | null>(null);
  useEffect(() => window.scrollTo(0, 0), []);

  const table = useMemo(() => (source ? readCsvTable(source.text, delimiter === 'auto' ? undefined : delimiter) : null), [source, delimiter]);
  const guessed = useMemo(() => (table && ch ? guessMapping(table, ch) : null), [table, ch]);
  const mapping = mappingChoice ?? guessed?.mapping ?? null;
  const mapped = useMemo(() => (table && mapping ? mapRows(table, mapping) : []), [table, mapping]);
  const decimal = decimalChoice ?? guessDecimal(mapped);
  const issues = ch && mapping ? mappingProblems(mapping, ch) : [];
  // The chart's samples change identity on every refresh: check again only when they really changed.
  const existing = view?.series.samples ?? [];
  const existingKey = `${existing.length}:${existing[existing.length - 1]?.id ?? ''}`;
  const ctx = useMemo((): ImportContext | null => {
    if (!ch || !state.person || !state.device || !source || issues.length) return null;
    const guard = view ? typoGuardOf(view.analysis.phases) : undefined;
    return {
      characteristic: ch, existing, ...(guard ? { guard } : {}), decimal, dateOrder, now: Date.now(),
      recordedBy: state.person.id, deviceId: state.device.deviceId, fileName: source.name,
    };
  }, [ch, existingKey, decimal, dateOrder, issues.length, source]);
  const { rows: checkedRows, running } = useCheckedRows(mapped, ctx);
  const checked = ctx ? checkedRows ?? [] : [];
  const summary = summarizeImport(checked);
  const firing = useMemo(() => (ch && checked.length
    ? signalsAtImported(ch, state.setup.phases, existing, samplesToImport(checked, includeFlagged)) : 0), [checked, includeFlagged]);

  if (!ch) return <main class="main"><p>This characteristic is not set up on this tablet.</p></main>;
  const back = () => {
    window.scrollTo(0, 0); // the chart is at the top of the screen we go back to
    actions.open({ name: 'characteristic', characteristicId });
  };
  const allowed = state.person?.role === 'engineer' || state.person?.role === 'admin';
  const notes = table ? exportNotes(table, ch) : { notes: [], cautions: [] };
  const toRecord = summary.ready + (includeFlagged ? summary.check : 0);
  const dataRows = table ? table.rows.length - (mapping?.hasHeader ? 1 : 0) : 0;
  const expected = isVariableChart(ch.chartType)
    ? `${valuesPerSubgroup(ch) === 1 ? 'the measured value' : `${valuesPerSubgroup(ch)} measured values (one column each)`}`
    : ch.chartType === 'c' ? 'the count' : 'the count and the quantity inspected';

  const read = (text: string, name: string) => {
    setSource({ text, name });
    setMappingChoice(null);
    setDecimalChoice(null);
    setIncludeFlagged(false);
    setOutcome(null);
  };
  const record = async () => {
    const samples = samplesToImport(checked, includeFlagged);
    setProgress({ done: 0, total: samples.length });
    const result = await actions.importSamples(ch.id, samples, (done, total) => setProgress({ done, total }));
    setProgress(null);
    setOutcome(result);
  };

  return (
    <main class="main stack" data-testid="import-screen">
      <div class="stack" style="gap:8px">
        <button type="button" class="btn quiet small" onClick={back} style="align-self:flex-start;padding-left:0">← {ch.name}</button>
        <h1>Import history into {ch.name}</h1>
        <p class="hint">
          One row per subgroup: the date and time it was taken, {expected}, and if you like a lot and a comment.
          A history export from Plumbline is read as it is. Nothing is recorded until you confirm.
        </p>
      </div>
      {ch.safetyCritical ? <SafetyCaution /> : null}
      {!allowed ? (
        <p class="caution" role="alert">Only a quality engineer (or admin) can import history. Ask one to sign in on this tablet.</p>
      ) : (
        <>
          <ImportSource onRead={read} current={source?.name} />
          {table && mapping ? (
            <section class="card stack" aria-labelledby="import-reading-title">
              <h2 id="import-reading-title">How the file is read</h2>
              <p data-testid="import-layout">
                {guessed?.layout === 'export' ? 'A Plumbline history export: its columns are read as written.' : 'Check what each column holds.'}
                {' '}{dataRows} data row{dataRows === 1 ? '' : 's'}, separated by {DELIMITER_NAMES[table.delimiter]}.
              </p>
              {dataRows <= 0 ? <p class="error-text" role="alert">The {source?.name === 'pasted text' ? 'pasted text' : 'file'} holds no rows of data.</p> : null}
              {notes.notes.map((n) => <p class="hint" key={n}>{n}</p>)}
              {notes.cautions.map((n) => <p class="caution" key={n}>{n}</p>)}
              {table.problems.map((p) => <p class="caution" key={p.line}>{p.message}</p>)}
              <ReadingOptions detected={table.delimiter} delimiter={delimiter} decimal={decimal} dateOrder={dateOrder}
                onDelimiter={(d) => { setDelimiter(d); setMappingChoice(null); }} onDecimal={setDecimalChoice} onDateOrder={setDateOrder} />
              {guessed?.layout === 'export' ? (
                <details>
                  <summary class="hint" style="min-height:48px;display:flex;align-items:center;cursor:pointer">Show the columns</summary>
                  <ColumnMappingPanel table={table} mapping={mapping} characteristic={ch} onChange={setMappingChoice} />
                </details>
              ) : <ColumnMappingPanel table={table} mapping={mapping} characteristic={ch} onChange={setMappingChoice} />}
              {issues.map((p) => <p class="error-text" role="alert" key={p}>{p}</p>)}
            </section>
          ) : null}
          {running && running.total > 0 ? (
            <p class="hint" role="status" data-testid="import-checking">Checking rows… {running.done} of {running.total}</p>
          ) : null}
          {checked.length ? (
            <ImportPreview rows={checked} summary={summary} characteristic={ch} separator={separator}
              includeFlagged={includeFlagged} onIncludeFlagged={setIncludeFlagged} firing={firing} />
          ) : null}
          {source && !issues.length ? (
            <section class="card stack" aria-label="Record the samples">
              {progress ? (
                <div class="stack" style="gap:8px" role="status">
                  <span>Recording… {progress.done} of {progress.total}</span>
                  <progress max={progress.total} value={progress.done} aria-label="Samples recorded" />
                </div>
              ) : outcome ? (
                <p class="caution all-clear" role="status" data-testid="import-outcome">
                  {outcome.saved} sample{outcome.saved === 1 ? '' : 's'} recorded on this tablet, marked as imported
                  {outcome.alreadyHeld ? ` (${outcome.alreadyHeld} were already here)` : ''}. They go to the site server with the next sync.
                </p>
              ) : null}
              <div class="row">
                <button type="button" class="btn primary" data-testid="import-confirm" disabled={toRecord === 0 || progress !== null || running !== null} onClick={() => void record()}>
                  {toRecord === 0 ? 'Nothing to record' : `Record ${toRecord} sample${toRecord === 1 ? '' : 's'}`}
                </button>
                <button type="button" class="btn" onClick={back}>{outcome ? 'Back to the chart' : 'Cancel'}</button>
              </div>
            </section>
          ) : null}
        </>
      )}
    </main>
  );
}

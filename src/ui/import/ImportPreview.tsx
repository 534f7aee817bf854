import { useState } from 'preact/hooks';
import type { CheckedRow, ImportSummary } from '../../app/import-check';
import { formatValue } from '../../app/number-entry';
import type { Characteristic, Sample } from '../../schema';
import { formatShortDateTime } from '../format-time';

const PAGE = 100;

function measured(s: Sample, ch: Characteristic, separator: ',' | '.'): string {
  if (s.values) return s.values.map((v) => formatValue(v, ch.decimals, separator)).join(' · ');
  return s.inspected !== undefined ? `${s.count} of ${s.inspected}` : String(s.count);
}

/** Rows with their line numbers and what is said about them; the first hundred, then more on request. */
function RowList({ rows, testId }: { rows: readonly CheckedRow[]; testId: string }) {
  const [shown, setShown] = useState(PAGE);
  return (
    <div class="stack" style="gap:8px">
      <ul class="import-problems" data-testid={testId}>
        {rows.slice(0, shown).map((r) => (
          <li key={r.line}><strong>Line {r.line}:</strong> {r.problems.join(' ')}</li>
        ))}
      </ul>
      {rows.length > shown ? (
        <button type="button" class="btn small" style="align-self:flex-start" onClick={() => setShown(shown + PAGE * 10)}>
          Show {Math.min(rows.length - shown, PAGE * 10)} more of {rows.length - shown}
        </button>
      ) : null}
    </div>
  );
}

/** What the import will do: totals, the rows that cannot be imported and why, flagged rows, and the samples as they will be recorded. */
export function ImportPreview({ rows, summary, characteristic, separator, includeFlagged, onIncludeFlagged, firing }: {
  rows: readonly CheckedRow[]; summary: ImportSummary; characteristic: Characteristic; separator: ',' | '.';
  includeFlagged: boolean; onIncludeFlagged: (v: boolean) => void;
  /** Signals that would begin at the imported points. */
  firing: number;
}) {
  const problems = rows.filter((r) => r.status === 'problem');
  const flagged = rows.filter((r) => r.status === 'check');
  const already = rows.filter((r) => r.status === 'already');
  const toRecord = rows.filter((r) => r.status === 'ready' || (includeFlagged && r.status === 'check'));
  return (
    <section class="card stack" aria-labelledby="import-preview-title" data-testid="import-preview">
      <h2 id="import-preview-title">Before anything is recorded</h2>
      <div class="figures figures-plain" aria-label="Rows of the file">
        <div class="figure"><div class="k">Ready to record</div><div class="v" data-testid="count-ready">{summary.ready}</div></div>
        <div class="figure"><div class="k">To check</div><div class="v" data-testid="count-check">{summary.check}</div></div>
        <div class="figure"><div class="k">Cannot be imported</div><div class="v" data-testid="count-problem">{summary.problem}</div></div>
        <div class="figure"><div class="k">Already on the chart</div><div class="v" data-testid="count-already">{summary.already}</div></div>
      </div>
      {problems.length ? (
        <div class="stack" style="gap:8px">
          <h3>Rows that cannot be imported as they are</h3>
          <p class="hint">Correct them in the file and read it again; rows already recorded are recognised and not recorded twice.</p>
          <RowList rows={problems} testId="problem-rows" />
        </div>
      ) : null}
      {flagged.length ? (
        <div class="stack" style="gap:8px">
          <h3>Rows to check</h3>
          <RowList rows={flagged} testId="check-rows" />
          <label class="row" style="gap:10px;min-height:48px">
            <input type="checkbox" checked={includeFlagged} style="width:24px;height:24px"
              onChange={(e) => onIncludeFlagged((e.target as HTMLInputElement).checked)} />
            {flagged.length === 1 ? 'This row is correct: record it too' : `These ${flagged.length} rows are correct: record them too`}
          </label>
        </div>
      ) : null}
      {already.length ? (
        <details>
          <summary class="hint" style="min-height:48px;display:flex;align-items:center;cursor:pointer">
            {already.length} row{already.length === 1 ? ' is' : 's are'} already on the chart and will be left out
          </summary>
          <RowList rows={already} testId="already-rows" />
        </details>
      ) : null}
      {firing > 0 ? (
        <p class="caution" data-testid="import-signals">
          The chart signals at {firing} of the imported point{firing === 1 ? '' : 's'}: each will show as a signal to answer and sign off, like any other.
        </p>
      ) : null}
      {toRecord.length ? (
        <div class="stack" style="gap:8px">
          <h3>As they will be recorded</h3>
          <div class="import-table-wrap">
            <table class="handover-table" data-testid="import-rows">
              <caption class="sr-only">Samples to record, with the line of the file each comes from</caption>
              <thead><tr><th scope="col">Line</th><th scope="col">Taken</th><th scope="col">{characteristic.unit}</th><th scope="col">Lot</th><th scope="col">Comment</th></tr></thead>
              <tbody>
                {toRecord.slice(0, 20).map((r) => (
                  <tr key={r.line}>
                    <td>{r.line}</td><td>{formatShortDateTime(r.sample!.takenAt)}</td><td>{measured(r.sample!, characteristic, separator)}</td>
                    <td>{r.sample!.lot ?? ''}</td><td>{r.sample!.excluded ? `Left out of limits: ${r.sample!.reason ?? ''}. ` : ''}{r.sample!.comment ?? ''}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
          {toRecord.length > 20 ? <p class="hint">… and {toRecord.length - 20} more.</p> : null}
        </div>
      ) : null}
    </section>
  );
}

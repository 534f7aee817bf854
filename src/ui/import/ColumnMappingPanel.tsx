import { COLUMN_ROLE_LABELS, type ColumnMapping, type ColumnRole } from '../../app/import-mapping';
import type { CsvTable } from '../../app/import-table';
import { isVariableChart, type Characteristic } from '../../schema';

const MEASURED: readonly ColumnRole[] = ['takenAt', 'date', 'timeOfDay', 'value', 'lot', 'comment', 'excluded', 'reason', 'sampleId', 'ignore'];
const COUNTED: readonly ColumnRole[] = ['takenAt', 'date', 'timeOfDay', 'count', 'inspected', 'lot', 'comment', 'excluded', 'reason', 'sampleId', 'ignore'];

/** One select per column of the file: what the column holds. Shows the header word and the first value. */
export function ColumnMappingPanel({ table, mapping, characteristic, onChange }: {
  table: CsvTable; mapping: ColumnMapping; characteristic: Characteristic; onChange: (m: ColumnMapping) => void;
}) {
  const roles = isVariableChart(characteristic.chartType) ? MEASURED : COUNTED;
  const header = mapping.hasHeader ? table.rows[0]?.cells ?? [] : [];
  const firstData = table.rows[mapping.hasHeader ? 1 : 0]?.cells ?? [];
  const set = (i: number, role: ColumnRole) => onChange({ ...mapping, roles: mapping.roles.map((r, k) => (k === i ? role : r)) });
  return (
    <fieldset class="stack" style="gap:10px" data-testid="column-mapping">
      <legend>What each column holds</legend>
      <label class="row" style="gap:10px;min-height:48px">
        <input type="checkbox" checked={mapping.hasHeader} style="width:24px;height:24px"
          onChange={(e) => onChange({ ...mapping, hasHeader: (e.target as HTMLInputElement).checked })} />
        The first row names the columns
      </label>
      <div class="import-columns">
        {mapping.roles.map((role, i) => {
          const name = header[i]?.trim() || `Column ${i + 1}`;
          const example = firstData[i]?.trim();
          return (
            <label class="entry-field" key={i}>
              <span class="hint">{name}{example ? ` · e.g. “${example.length > 24 ? `${example.slice(0, 24)}…` : example}”` : ''}</span>
              <select class="text-input" value={role} onChange={(e) => set(i, (e.target as HTMLSelectElement).value as ColumnRole)}>
                {roles.map((r) => <option value={r} key={r}>{COLUMN_ROLE_LABELS[r]}</option>)}
              </select>
            </label>
          );
        })}
      </div>
    </fieldset>
  );
}

import { useState } from 'preact/hooks';
import { decodeCsvBytes, type TextEncodingName } from '../../app/import-table';

/** Where the rows come from: a CSV file picked on the tablet, or text pasted from a spreadsheet. */
export function ImportSource({ onRead, current }: { onRead: (text: string, name: string) => void; current: string | undefined }) {
  const [pasted, setPasted] = useState('');
  const [problem, setProblem] = useState<string | null>(null);
  const [encoding, setEncoding] = useState<TextEncodingName | null>(null);
  const pick = async (input: HTMLInputElement) => {
    const file = input.files?.[0];
    if (!file) return;
    try {
      setProblem(null);
      const read = decodeCsvBytes(new Uint8Array(await file.arrayBuffer()));
      setEncoding(read.encoding);
      onRead(read.text, file.name);
    } catch (e) {
      setProblem(`The file could not be read: ${e instanceof Error ? e.message : String(e)}`);
    }
  };
  return (
    <section class="card stack" aria-labelledby="import-source-title">
      <h2 id="import-source-title">The rows to import</h2>
      <div class="import-source">
        <label class="stack" style="gap:6px">
          <span>A CSV file</span>
          <input type="file" accept=".csv,.txt,text/csv,text/plain" class="text-input" data-testid="import-file"
            onChange={(e) => void pick(e.target as HTMLInputElement)} />
        </label>
        <div class="stack" style="gap:6px">
          <label class="stack" style="gap:6px">
            <span>Or paste rows from a spreadsheet</span>
            <textarea class="text-input" value={pasted} data-testid="import-paste" rows={4}
              onInput={(e) => setPasted((e.target as HTMLTextAreaElement).value)} />
          </label>
          <button type="button" class="btn small" style="align-self:flex-start" disabled={!pasted.trim()} onClick={() => { setEncoding(null); onRead(pasted, 'pasted text'); }}>
            Read the pasted rows
          </button>
        </div>
      </div>
      {current ? (
        <p class="hint" data-testid="import-current">
          Reading: {current}{encoding && encoding !== 'UTF-8' ? ` (characters read as ${encoding})` : ''}
        </p>
      ) : null}
      {problem ? <p class="error-text" role="alert">{problem}</p> : null}
    </section>
  );
}

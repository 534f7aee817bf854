import { useEffect, useState } from 'preact/hooks';
import { createRowChecker, type CheckedRow, type ImportContext } from '../../app/import-check';
import type { MappedRow } from '../../app/import-mapping';

/** Main-thread time one slice of checking may take before the screen gets a turn to paint (ms). */
const SLICE_MS = 12;

export interface CheckProgress {
  /** The rows as last checked in full (kept while a new check runs), or null before the first. */
  readonly rows: readonly CheckedRow[] | null;
  /** A check is running: `done` of `total` rows so far. */
  readonly running: { readonly done: number; readonly total: number } | null;
}

/**
 * Checks the mapped rows in slices of about SLICE_MS between paints, so a file of ten thousand rows
 * does not freeze the screen. A new input cancels the check under way.
 */
export function useCheckedRows(mapped: readonly MappedRow[], ctx: ImportContext | null): CheckProgress {
  const [rows, setRows] = useState<readonly CheckedRow[] | null>(null);
  const [running, setRunning] = useState<CheckProgress['running']>(null);
  useEffect(() => {
    if (!ctx) {
      setRows(null);
      setRunning(null);
      return;
    }
    let cancelled = false;
    const check = createRowChecker(ctx);
    const out: CheckedRow[] = [];
    const step = () => {
      if (cancelled) return;
      const until = performance.now() + SLICE_MS;
      while (out.length < mapped.length && performance.now() < until) {
        for (let k = 0; k < 50 && out.length < mapped.length; k++) out.push(check(mapped[out.length]!));
      }
      if (out.length < mapped.length) {
        setRunning({ done: out.length, total: mapped.length });
        setTimeout(step, 0);
      } else {
        setRows(out);
        setRunning(null);
      }
    };
    setRunning({ done: 0, total: mapped.length });
    step();
    return () => {
      cancelled = true;
    };
  }, [mapped, ctx]);
  return { rows, running };
}

// CSV import of points (label,x,y,z in mm; optional directions): drop or pick a file; the server
// checks it at once (…/geometry/import/check) so the preview marks the bad rows before Import; the
// import is all or nothing unless the lead ticks "import the good rows only" (badRows: 'skip').
import { useRef, useState, type DragEvent } from 'react';
import { useQueryClient } from '@tanstack/react-query';
import { MAX_IMPORT_BYTES } from '@resonote/contracts';
import { api, ApiError } from '../../../lib/api.ts';
import { keys } from '../../../lib/campaign-data.ts';
import { useToast } from '../../../lib/toast.tsx';
import { Button, Notice, Panel } from '../../../components/ui.tsx';

interface Loaded {
  name: string;
  text: string;
  rows: string[][];
  count: number;
}

interface CheckAnswer {
  ok: boolean;
  rows: number;
  goodRows: number;
  badRows: number;
  message: string | null;
  problems: { line: number; message: string }[];
}

function preview(text: string): { rows: string[][]; count: number } {
  const lines = text.replace(/^\uFEFF/, '').split(/\r?\n/).filter((l) => l.trim() !== '');
  const sep = [',', ';', '\t'].map((s) => ({ s, n: (lines[0] ?? '').split(s).length })).sort((a, b) => b.n - a.n)[0]!.s;
  return { rows: lines.slice(0, 6).map((l) => l.split(sep).map((c) => c.trim().replace(/^"|"$/g, ''))), count: Math.max(0, lines.length - 1) };
}

export function GeometryImport({ campaignId }: { campaignId: string }) {
  const client = useQueryClient();
  const toast = useToast();
  const input = useRef<HTMLInputElement>(null);
  const [file, setFile] = useState<Loaded>();
  const [mode, setMode] = useState<'merge' | 'replace'>('merge');
  const [over, setOver] = useState(false);
  const [problems, setProblems] = useState<{ message: string; lines: { line: number; message: string }[] }>();
  const [busy, setBusy] = useState(false);
  const [check, setCheck] = useState<CheckAnswer | { failed: string }>();
  const [skipBad, setSkipBad] = useState(false);

  async function load(f: File | undefined) {
    if (!f) return;
    setProblems(undefined);
    if (f.size > MAX_IMPORT_BYTES) {
      setFile(undefined);
      setProblems({ message: `${f.name} is larger than ${MAX_IMPORT_BYTES / 1024 / 1024} MB; split it into several files.`, lines: [] });
      return;
    }
    const text = await f.text();
    setFile({ name: f.name, text, ...preview(text) });
    setSkipBad(false);
    setCheck(undefined);
    try {
      setCheck(await api<CheckAnswer>(`/campaigns/${campaignId}/geometry/import/check`, { body: { csv: text } }));
    } catch (err) {
      setCheck({ failed: err instanceof ApiError ? err.message : 'The file could not be checked.' });
    }
  }
  const checked = check && !('failed' in check) ? check : undefined;
  const importCount = checked && !checked.ok && skipBad ? checked.goodRows : (file?.count ?? 0);

  function drop(event: DragEvent) {
    event.preventDefault();
    setOver(false);
    void load(event.dataTransfer.files[0]);
  }
  async function submit() {
    if (!file) return;
    setBusy(true);
    setProblems(undefined);
    try {
      const r = await api<{ added: number; updated: number; removed: number; retired: number; total: number; skippedRows: number }>(`/campaigns/${campaignId}/geometry/import`, { body: { csv: file.text, mode, badRows: skipBad ? 'skip' : 'refuse' } });
      await Promise.all([client.invalidateQueries({ queryKey: keys.points(campaignId) }), client.invalidateQueries({ queryKey: keys.schedule(campaignId) })]);
      toast('ok', `Imported ${file.name}: ${r.added} added, ${r.updated} updated, ${r.removed} removed${r.retired ? `, ${r.retired} retired (they have hits)` : ''}${r.skippedRows ? `; ${r.skippedRows} bad row${r.skippedRows === 1 ? '' : 's'} skipped` : ''}.`);
      setFile(undefined);
      setCheck(undefined);
      if (input.current) input.current.value = '';
    } catch (err) {
      if (err instanceof ApiError) {
        const lines = Array.isArray(err.details) ? (err.details as { line: number; message: string }[]).filter((d) => typeof d?.line === 'number') : [];
        setProblems({ message: err.message, lines });
      } else setProblems({ message: 'The import failed.', lines: [] });
    } finally {
      setBusy(false);
    }
  }

  return (
    <Panel title="Import points from CSV">
      <div className="space-y-3">
        <div
          onDragOver={(e) => {
            e.preventDefault();
            setOver(true);
          }}
          onDragLeave={() => setOver(false)}
          onDrop={drop}
          className={`flex flex-col items-center justify-center gap-2 rounded-md border-2 border-dashed px-4 py-6 text-center text-sm ${over ? 'border-accent bg-accent-soft/50' : 'border-[var(--line)]'}`}
          data-testid="csv-drop"
        >
          <p>
            Drop a CSV file here, or{' '}
            <label className="cursor-pointer font-medium text-accent-strong underline">
              choose a file
              <input ref={input} type="file" accept=".csv,text/csv,text/plain" className="sr-only" onChange={(e) => void load(e.target.files?.[0])} data-testid="csv-file" />
            </label>
            .
          </p>
          <p className="text-xs text-[var(--muted)]">
            Header <code className="num">label,x,y,z</code>, coordinates in mm; an optional <code className="num">directions</code> column such as <code className="num">+Z -X</code>.
          </p>
        </div>
        {file && (
          <div className="space-y-2" data-testid="csv-preview">
            <p className="text-sm">
              <span className="font-medium">{file.name}</span> — <span className="num">{file.count}</span> point row{file.count === 1 ? '' : 's'}. First rows:
            </p>
            <div className="overflow-x-auto">
              <table className="num text-xs">
                <tbody>
                  {file.rows.map((r, i) => {
                    const problem = checked?.problems.find((p) => p.line === i + 1);
                    return (
                      <tr key={i} className={`${i === 0 ? 'font-semibold' : 'border-t border-[var(--line)]'} ${problem ? 'bg-bad/8 text-bad' : ''}`} data-bad-row={problem ? i + 1 : undefined}>
                        <td className="pr-3 text-[var(--muted)]">{i + 1}</td>
                        <td className="w-4 pr-1" aria-label={problem ? 'bad row' : undefined}>
                          {problem ? '✕' : ''}
                        </td>
                        {r.map((c, j) => (
                          <td key={j} className="pr-4 py-0.5">
                            {c}
                          </td>
                        ))}
                        <td className="font-sans">{problem?.message}</td>
                      </tr>
                    );
                  })}
                </tbody>
              </table>
            </div>
            {check && 'failed' in check && <Notice tone="error">{check.failed}</Notice>}
            {checked && checked.ok && <p className="text-sm text-ok" data-testid="csv-check">✓ Every row reads well: {checked.rows} point{checked.rows === 1 ? '' : 's'}.</p>}
            {checked && !checked.ok && (
              <div className="space-y-2 rounded-md border border-bad/40 bg-bad/8 px-3 py-2 text-sm" data-testid="csv-check">
                <p className="font-medium text-bad">
                  ✕ {checked.goodRows > 0 ? `${checked.badRows} of ${checked.rows} rows have a problem; ${checked.goodRows} are good.` : checked.message}
                </p>
                {checked.problems.length > 0 && (
                  <ul className="num max-h-40 list-none space-y-0.5 overflow-y-auto text-xs">
                    {checked.problems.map((p, i) => (
                      <li key={i}>
                        <span className="font-semibold">Line {p.line}:</span> <span className="font-sans">{p.message}</span>
                      </li>
                    ))}
                  </ul>
                )}
                {checked.goodRows > 0 && (
                  <label className="flex items-center gap-2">
                    <input type="checkbox" checked={skipBad} onChange={(e) => setSkipBad(e.target.checked)} disabled={mode === 'replace'} data-testid="skip-bad-rows" />
                    Import the {checked.goodRows} good rows only and skip the bad ones{mode === 'replace' ? ' (merge only: replace would delete the points of skipped rows)' : ''}
                  </label>
                )}
              </div>
            )}
            <fieldset className="flex flex-wrap gap-4 text-sm">
              <legend className="sr-only">Import mode</legend>
              <label className="flex items-center gap-2">
                <input type="radio" name="mode" checked={mode === 'merge'} onChange={() => setMode('merge')} /> Merge: add new labels, update existing ones
              </label>
              <label className="flex items-center gap-2">
                <input type="radio" name="mode" checked={mode === 'replace'} onChange={() => setMode('replace')} /> Replace: points not in the file are deleted (retired if they have hits)
              </label>
            </fieldset>
            <div className="flex gap-2">
              <Button onClick={submit} disabled={busy || !checked || (!checked.ok && !(skipBad && mode === 'merge' && checked.goodRows > 0))}>
                {busy ? 'Importing…' : `Import ${importCount} point${importCount === 1 ? '' : 's'}`}
              </Button>
              <Button
                variant="ghost"
                onClick={() => {
                  setFile(undefined);
                  setCheck(undefined);
                }}
              >
                Discard
              </Button>
            </div>
          </div>
        )}
        {problems && (
          <div data-testid="csv-problems">
            <Notice tone="error">
              <p>{/nothing was imported/i.test(problems.message) ? problems.message : `${problems.message} Nothing was imported.`}</p>
              {problems.lines.length > 0 && (
                <ul className="mt-1 list-none space-y-0.5">
                  {problems.lines.map((p, i) => (
                    <li key={i}>
                      <span className="num font-semibold">Line {p.line}:</span> {p.message}
                    </li>
                  ))}
                </ul>
              )}
            </Notice>
          </div>
        )}
      </div>
    </Panel>
  );
}

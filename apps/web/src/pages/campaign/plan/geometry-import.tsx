// CSV import of points (label,x,y,z in mm; optional directions): drop or pick a file, check the
// preview, import all or nothing; the server's row-numbered problems are listed when it refuses.
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
  }
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
      const r = await api<{ added: number; updated: number; removed: number; retired: number; total: number }>(`/campaigns/${campaignId}/geometry/import`, { body: { csv: file.text, mode } });
      await Promise.all([client.invalidateQueries({ queryKey: keys.points(campaignId) }), client.invalidateQueries({ queryKey: keys.schedule(campaignId) })]);
      toast('ok', `Imported ${file.name}: ${r.added} added, ${r.updated} updated, ${r.removed} removed${r.retired ? `, ${r.retired} retired (they have hits)` : ''}.`);
      setFile(undefined);
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
                  {file.rows.map((r, i) => (
                    <tr key={i} className={i === 0 ? 'font-semibold' : 'border-t border-[var(--line)]'}>
                      <td className="pr-3 text-[var(--muted)]">{i + 1}</td>
                      {r.map((c, j) => (
                        <td key={j} className="pr-4 py-0.5">
                          {c}
                        </td>
                      ))}
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
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
              <Button onClick={submit} disabled={busy}>
                {busy ? 'Importing…' : `Import ${file.count} point${file.count === 1 ? '' : 's'}`}
              </Button>
              <Button variant="ghost" onClick={() => setFile(undefined)}>
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

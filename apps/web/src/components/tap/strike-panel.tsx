// Where hits come from: the simulated rig (tip and a big Strike button) or an uploaded recording
// (file picker or drag-and-drop, units, progress bar).
import { useRef, useState, type DragEvent, type ReactNode } from 'react';
import { Button } from '../ui.tsx';
import type { UploadFields } from './use-record.ts';
import type { HammerTips, TipOption } from './use-hammer-tips.ts';

export function Kbd({ children }: { children: string }) {
  return <kbd className="num ml-1 rounded border border-current/40 px-1.5 py-0.5 text-xs font-semibold opacity-90">{children}</kbd>;
}

export function StrikePanel({
  tips,
  tip,
  onTip,
  onStrike,
  onUpload,
  busy,
  progress,
  failedUpload,
  live,
}: {
  /** The hammer's registered tips, or the rig's own when it has none (use-hammer-tips.ts). */
  tips: HammerTips;
  tip: TipOption | null;
  onTip: (t: TipOption) => void;
  onStrike: () => void;
  onUpload: (fields: UploadFields) => void;
  busy: string | null;
  progress: number | null;
  failedUpload: UploadFields | null;
  /** The live input's panel (live-panel.tsx), shown under its own tab when given. */
  live?: ReactNode;
}) {
  const [source, setSource] = useState<'rig' | 'upload' | 'live'>('rig');
  const [file, setFile] = useState<File | null>(null);
  const [units, setUnits] = useState<'volts' | 'engineering'>('volts');
  const [rate, setRate] = useState('');
  const [fullScale, setFullScale] = useState('');
  const [dragging, setDragging] = useState(false);
  const input = useRef<HTMLInputElement>(null);

  const drop = (e: DragEvent) => {
    e.preventDefault();
    setDragging(false);
    const f = e.dataTransfer.files[0];
    if (f) setFile(f);
  };
  const tab = (value: 'rig' | 'upload' | 'live', label: string) => (
    <button
      type="button"
      role="tab"
      aria-selected={source === value}
      onClick={() => setSource(value)}
      className={`min-h-11 flex-1 rounded-md px-3 text-sm font-medium ${source === value ? 'bg-[var(--panel)] text-[var(--ink)] shadow-sm' : 'text-[var(--muted)] hover:text-[var(--ink)]'}`}
    >
      {label}
    </button>
  );

  return (
    <div className="space-y-3">
      <div role="tablist" aria-label="Source of hits" className="flex gap-1 rounded-lg bg-[var(--surface)] p-1">
        {tab('rig', 'Simulated rig')}
        {tab('upload', 'Upload recording')}
        {live && tab('live', 'Live input')}
      </div>
      {source === 'live' && live ? (
        <div role="tabpanel" aria-label="Live input">
          {live}
        </div>
      ) : source === 'rig' ? (
        <div className="space-y-3" role="tabpanel" aria-label="Simulated rig">
          <div className="flex flex-col gap-1">
            <label htmlFor="rig-tip" className="text-sm font-medium">
              Hammer tip
            </label>
            <select id="rig-tip" value={tip?.value ?? ''} onChange={(e) => { const t = tips.options.find((o) => o.value === e.target.value); if (t) onTip(t); }} className="min-h-11 rounded-md border border-[var(--line)] bg-[var(--panel)] px-3 text-sm" data-testid="tip-select" data-registered={tips.registered}>
              {tips.options.map((o) => (
                <option key={o.value} value={o.value}>
                  {o.label}
                </option>
              ))}
            </select>
            {tips.registered && tip && (
              <p className="text-xs text-[var(--muted)]" data-testid="tip-as-rig">
                Tips registered in Kit for {tips.hammer}; the simulated rig strikes with its {tip.hardness} tip for this one.
              </p>
            )}
            {!tips.registered && !tips.loading && (
              <p className="text-xs text-[var(--muted)]" data-testid="tip-fallback">
                {tips.hammer ? `The hammer ${tips.hammer} has no tips registered in Kit` : 'No hammer is on the channel map yet'}, so the rig's own soft, medium and hard tips are offered. A lead adds the hammer's tips in Kit.
              </p>
            )}
          </div>
          <Button onClick={onStrike} disabled={busy !== null || !tip} className="min-h-16 w-full text-lg" data-testid="strike">
            {busy === 'strike' ? 'Striking…' : 'Strike'}
            <Kbd>Space</Kbd>
            <Kbd>S</Kbd>
          </Button>
          <p className="text-xs text-[var(--muted)]">The rig strikes a structure model of this campaign; its hits go through the same checks as real ones.</p>
        </div>
      ) : (
        <form
          className="space-y-3"
          role="tabpanel"
          aria-label="Upload recording"
          onSubmit={(e) => {
            e.preventDefault();
            if (file) onUpload({ file, units, sampleRateHz: rate, fullScaleVolts: fullScale });
          }}
        >
          <div
            onDragOver={(e) => {
              e.preventDefault();
              setDragging(true);
            }}
            onDragLeave={() => setDragging(false)}
            onDrop={drop}
            className={`flex min-h-24 flex-col items-center justify-center gap-1 rounded-md border-2 border-dashed p-3 text-center text-sm ${dragging ? 'border-accent bg-accent-soft' : 'border-[var(--line)]'}`}
          >
            <p>{file ? <span className="num">{file.name} · {(file.size / 1024).toFixed(0)} kB</span> : 'Drop a recording here (CSV, WAV or JSON), channels in channel-number order'}</p>
            <Button type="button" variant="secondary" onClick={() => input.current?.click()}>
              Choose a file…
            </Button>
            <input ref={input} type="file" accept=".csv,.wav,.json,text/csv,audio/wav,application/json" className="sr-only" data-testid="recording-file" aria-label="Recording file" onChange={(e) => setFile(e.target.files?.[0] ?? null)} />
          </div>
          <fieldset className="flex flex-wrap gap-3 text-sm">
            <legend className="mb-1 text-sm font-medium">Values in the file are</legend>
            <label className="flex min-h-10 items-center gap-2">
              <input type="radio" name="units" checked={units === 'volts'} onChange={() => setUnits('volts')} /> volts (the kit's sensitivities convert)
            </label>
            <label className="flex min-h-10 items-center gap-2">
              <input type="radio" name="units" checked={units === 'engineering'} onChange={() => setUnits('engineering')} /> engineering units (N, m/s²)
            </label>
          </fieldset>
          <div className="grid grid-cols-2 gap-2">
            <label className="flex flex-col gap-1 text-xs font-medium">
              Sample rate (if the file has none)
              <span className="flex items-center gap-1">
                <input value={rate} onChange={(e) => setRate(e.target.value)} inputMode="decimal" className="num min-h-10 w-full rounded-md border border-[var(--line)] bg-[var(--panel)] px-2" />
                <span className="num text-[var(--muted)]">Hz</span>
              </span>
            </label>
            <label className="flex flex-col gap-1 text-xs font-medium">
              Full scale (PCM WAV)
              <span className="flex items-center gap-1">
                <input value={fullScale} onChange={(e) => setFullScale(e.target.value)} inputMode="decimal" placeholder="1" className="num min-h-10 w-full rounded-md border border-[var(--line)] bg-[var(--panel)] px-2" />
                <span className="num text-[var(--muted)]">V</span>
              </span>
            </label>
          </div>
          {progress !== null && (
            <div className="space-y-1" aria-live="polite">
              <div className="h-2 overflow-hidden rounded-full bg-[var(--line)]" role="progressbar" aria-label="Upload progress" aria-valuemin={0} aria-valuemax={100} aria-valuenow={Math.round(progress * 100)}>
                <div className="h-full bg-accent transition-[width]" style={{ width: `${Math.round(progress * 100)}%` }} />
              </div>
              <p className="num text-xs text-[var(--muted)]">{progress < 1 ? `Uploading… ${Math.round(progress * 100)} %` : 'Uploaded; checking the hits…'}</p>
            </div>
          )}
          <Button type="submit" disabled={!file || busy !== null} className="min-h-14 w-full text-base">
            {busy === 'upload' ? 'Uploading…' : failedUpload ? 'Retry the upload' : 'Upload and check'}
          </Button>
        </form>
      )}
    </div>
  );
}

// The data bundles: a ZIP of CSV files (optionally with the raw time data of every hit) and one
// JSON file, each with its download progress, and what is inside.
import { useState } from 'react';
import { Button } from '../ui.tsx';
import { TransferProgress } from './transfer-progress.tsx';
import { useDownload } from './use-download.ts';

const contents: [string, string][] = [
  ['README.txt', 'units, DOF labels, the sign convention and where each number comes from'],
  ['campaign.json', 'the campaign: structure, client, test type, reference DOFs'],
  ['geometry.csv', 'points (label, x, y, z in mm, directions); lines.csv the lines between them'],
  ['schedule.csv', 'every DOF pair with its status, hit counts and its FRF files'],
  ['frf/…', 'one CSV per FRF: frequency (Hz), H1 and H2 (re, im), coherence; frf/index.csv with the input hash and hits of each'],
  ['modes.csv', 'the mode table (f in Hz, ζ in % of critical, MPC, values before the window correction); mode-shapes.csv and mac.csv'],
  ['settings.json', 'the acquisition settings in force, with their version; kit.json the hammer and sensors with calibration'],
];

export function BundlePanel({ campaignId }: { campaignId: string }) {
  const zip = useDownload();
  const json = useDownload();
  const [raw, setRaw] = useState(false);
  return (
    <div className="space-y-3">
      <div className="flex flex-wrap items-center gap-x-4 gap-y-2">
        <Button type="button" disabled={zip.busy} onClick={() => void zip.start(`/campaigns/${campaignId}/export/bundle.zip${raw ? '?raw=1' : ''}`, 'bundle.zip')}>
          <span aria-hidden>⤓</span>
          Download bundle.zip
        </Button>
        <label className="flex min-h-10 items-center gap-2 text-sm">
          <input type="checkbox" checked={raw} onChange={(e) => setRaw(e.target.checked)} className="h-4 w-4 accent-[var(--color-accent)]" />
          include raw time data
        </label>
        <Button type="button" variant="secondary" disabled={json.busy} onClick={() => void json.start(`/campaigns/${campaignId}/export/bundle.json`, 'bundle.json')}>
          <span aria-hidden>⤓</span>
          Download bundle.json
        </Button>
      </div>
      {raw && <p className="text-xs text-[var(--muted)]">Raw time data adds every hit's samples and makes the file much larger.</p>}
      {zip.progress && <TransferProgress progress={zip.progress} label="Downloading bundle.zip" />}
      {json.progress && <TransferProgress progress={json.progress} label="Downloading bundle.json" />}
      <div>
        <h3 className="mb-1 text-xs font-semibold text-[var(--muted)]">Inside bundle.zip</h3>
        <ul className="divide-y divide-[var(--line)] text-sm" data-testid="bundle-contents">
          {contents.map(([name, what]) => (
            <li key={name} className="flex flex-col gap-x-3 py-1 sm:flex-row">
              <span className="num w-36 shrink-0 font-medium">{name}</span>
              <span className="text-[var(--muted)]">{what}</span>
            </li>
          ))}
          {raw && (
            <li className="flex flex-col gap-x-3 py-1 sm:flex-row">
              <span className="num w-36 shrink-0 font-medium">hits/…</span>
              <span className="text-[var(--muted)]">the samples of every hit (time in s, force in N, responses in m/s²); hits/index.csv with each verdict, reason and SHA-256</span>
            </li>
          )}
        </ul>
        <p className="mt-1 text-xs text-[var(--muted)]">bundle.json holds the same content in one file.</p>
      </div>
    </div>
  );
}

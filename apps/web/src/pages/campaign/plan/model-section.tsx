// Plan → Model: FE model versions (upload with the file's problems listed by row, the versions),
// the test point ↔ node map (automatic or by hand), and the pre-test proposal — where to measure
// (Effective Independence, Kammer 1991), where to put the reference (driving-point measure) and
// whether the planned DOFs tell the modes apart (auto-MAC) — which a lead accepts into the plan.
import { useEffect, useMemo, useRef, useState } from 'react';
import { useQueryClient } from '@tanstack/react-query';
import { MAX_FE_CHARS } from '@resonote/contracts';
import { api, ApiError } from '../../../lib/api.ts';
import { keys, type Campaign } from '../../../lib/campaign-data.ts';
import { feKeys, useFeModel, useFeModels, type FeModelDetail, type FeProblem, type FeProposal } from '../../../lib/fe-model-data.ts';
import { useFailure } from '../../../lib/mutation.ts';
import { useToast } from '../../../lib/toast.tsx';
import { Button, Field, Notice, Panel, Spinner } from '../../../components/ui.tsx';
import { MacMatrix } from '../../../components/mac-matrix.tsx';
import { formatWhen } from '../../../lib/format-date.ts';

const where = (p: FeProblem) => (p.row !== null ? `line ${p.row}${p.column ? `, ${p.column}` : ''}` : (p.path ?? 'the file'));

function ModelUpload({ campaignId, onUploaded }: { campaignId: string; onUploaded: (id: string) => void }) {
  const client = useQueryClient();
  const toast = useToast();
  const input = useRef<HTMLInputElement>(null);
  const [file, setFile] = useState<File>();
  const [label, setLabel] = useState('');
  const [busy, setBusy] = useState(false);
  const [problems, setProblems] = useState<{ message: string; list: FeProblem[]; truncated: boolean }>();

  async function submit() {
    if (!file) return;
    setProblems(undefined);
    if (file.size > MAX_FE_CHARS) {
      setProblems({ message: `${file.name} is larger than ${MAX_FE_CHARS / 1024 / 1024} MB, the most a model file may be.`, list: [], truncated: false });
      return;
    }
    setBusy(true);
    try {
      const text = await file.text();
      const r = await api<{ model: { id: string; versionLabel: string; nodeCount: number; modeCount: number } }>(`/campaigns/${campaignId}/fe-models`, { body: { text, versionLabel: label.trim(), fileName: file.name } });
      await client.invalidateQueries({ queryKey: feKeys.list(campaignId) });
      toast('ok', `Model version ${r.model.versionLabel} stored: ${r.model.nodeCount} nodes, ${r.model.modeCount} modes.`);
      setFile(undefined);
      setLabel('');
      if (input.current) input.current.value = '';
      onUploaded(r.model.id);
    } catch (err) {
      if (err instanceof ApiError) {
        const d = err.details as { problems?: FeProblem[]; truncated?: boolean } | undefined;
        setProblems({ message: err.message, list: d?.problems ?? [], truncated: Boolean(d?.truncated) });
      } else setProblems({ message: 'The upload failed.', list: [], truncated: false });
    } finally {
      setBusy(false);
    }
  }

  return (
    <div className="space-y-3" data-testid="model-upload">
      <div className="grid gap-3 sm:grid-cols-2">
        <div className="flex flex-col gap-1">
          <label htmlFor="model-file" className="text-sm font-medium">
            Model file (CSV or JSON)
          </label>
          <input ref={input} id="model-file" type="file" accept=".csv,.json,text/csv,application/json,text/plain" className="text-sm" onChange={(e) => setFile(e.target.files?.[0])} data-testid="model-file" />
          <p className="text-xs text-[var(--muted)]">Resonote’s FE-modes format: nodes in mm or m, frequencies in Hz, shapes per node and axis (see the format notes in the repository, docs/fe-model-format.md).</p>
        </div>
        <Field id="model-version" label="Version label" hint="For example “design v1” or “after joint update”." value={label} onChange={(e) => setLabel(e.target.value)} maxLength={60} />
      </div>
      <Button onClick={() => void submit()} disabled={!file || !label.trim() || busy}>
        {busy ? 'Uploading…' : 'Upload model'}
      </Button>
      {problems && (
        <Notice tone="error">
          <p>{problems.message}</p>
          {problems.list.length > 0 && (
            <ul className="mt-1 list-disc space-y-0.5 pl-5" data-testid="model-problems">
              {problems.list.map((p, i) => (
                <li key={i}>
                  <span className="num">{where(p)}</span>: {p.message}
                </li>
              ))}
            </ul>
          )}
          {problems.truncated && <p className="mt-1">More problems follow; fix these and upload again.</p>}
        </Notice>
      )}
    </div>
  );
}

function MapTable({ campaignId, detail, canLead }: { campaignId: string; detail: FeModelDetail; canLead: boolean }) {
  const client = useQueryClient();
  const fail = useFailure();
  const toast = useToast();
  const [by, setBy] = useState<'label' | 'nearest'>('label');
  const [tolerance, setTolerance] = useState('10');
  const [edits, setEdits] = useState<Record<string, string>>({});
  const [refusal, setRefusal] = useState<string>();
  const [busy, setBusy] = useState(false);
  const key = feKeys.one(campaignId, detail.model.id);
  const nodes = useMemo(() => new Set(detail.nodes.map((n) => n.label.toLowerCase())), [detail.nodes]);
  const links = detail.map.links;

  /** Runs one change of the map (the answer's words go in the toast); a refusal for units or axes is shown in place. */
  async function change(run: () => Promise<string>) {
    setBusy(true);
    setRefusal(undefined);
    try {
      const said = await run();
      await client.invalidateQueries({ queryKey: key });
      toast('ok', said);
      setEdits({});
    } catch (err) {
      if (err instanceof ApiError && (err.code === 'units-mismatch' || err.code === 'axes-mismatch')) setRefusal(err.message);
      else fail(err, [key]);
    } finally {
      setBusy(false);
    }
  }
  const auto = () =>
    change(async () => {
      const r = await api<{ linked: number; unlinked: number }>(`/campaigns/${campaignId}/fe-models/${detail.model.id}/map/auto`, { body: by === 'label' ? { by } : { by, toleranceMm: Number(tolerance) } });
      return `${r.linked} point${r.linked === 1 ? '' : 's'} linked to a node${r.unlinked ? `, ${r.unlinked} without one` : ''}.`;
    });
  const save = () =>
    change(async () => {
      const changed = Object.entries(edits).map(([point, node]) => ({ point, node: node.trim() === '' ? null : node.trim() }));
      await api(`/campaigns/${campaignId}/fe-models/${detail.model.id}/map`, { method: 'PATCH', body: { version: detail.map.version, links: changed } });
      return `${changed.length} link${changed.length === 1 ? '' : 's'} saved.`;
    });

  const badEdits = Object.values(edits).filter((v) => v.trim() !== '' && !nodes.has(v.trim().toLowerCase()));

  return (
    <div className="space-y-3" data-testid="model-map">
      <h3 className="text-sm font-semibold">Test points ↔ model nodes</h3>
      {canLead && (
        <div className="flex flex-wrap items-end gap-3">
          <label className="flex flex-col gap-1 text-sm">
            <span className="font-medium">Link by</span>
            <select className="min-h-10 rounded-md border border-[var(--line)] bg-[var(--panel)] px-2" value={by} onChange={(e) => setBy(e.target.value as 'label' | 'nearest')} data-testid="map-by">
              <option value="label">same label</option>
              <option value="nearest">nearest node within a tolerance</option>
            </select>
          </label>
          {by === 'nearest' && <Field id="map-tolerance" label="Tolerance (mm)" type="number" min={0.1} step="any" value={tolerance} onChange={(e) => setTolerance(e.target.value)} />}
          <Button variant="secondary" onClick={() => void auto()} disabled={busy}>
            Link automatically
          </Button>
        </div>
      )}
      {refusal && <Notice tone="error">{refusal}</Notice>}
      {links.length === 0 ? (
        <p className="text-sm text-[var(--muted)]">No point is linked yet. {canLead ? 'Link them automatically, or accept a proposal below (its points are linked to their nodes).' : 'A lead links them.'}</p>
      ) : (
        <div className="max-h-80 overflow-auto">
          <table className="text-sm">
            <thead className="sticky top-0 bg-[var(--panel)]">
              <tr className="text-left text-[var(--muted)]">
                <th className="pr-4 font-medium">Point</th>
                <th className="pr-4 font-medium">Node</th>
                <th className="pr-4 text-right font-medium">Distance (mm)</th>
                <th className="pr-4 font-medium">How</th>
              </tr>
            </thead>
            <tbody>
              {links.map((l) => (
                <tr key={l.point} className="border-t border-[var(--line)]">
                  <td className="num pr-4 py-1">{l.point}</td>
                  <td className="pr-4">
                    {canLead ? (
                      <input
                        aria-label={`Node for point ${l.point}`}
                        className="num min-h-8 w-28 rounded border border-[var(--line)] bg-[var(--panel)] px-2"
                        value={edits[l.point] ?? l.node ?? ''}
                        placeholder="none"
                        onChange={(e) => setEdits({ ...edits, [l.point]: e.target.value })}
                      />
                    ) : (
                      <span className="num">{l.node ?? 'none'}</span>
                    )}
                  </td>
                  <td className="num pr-4 text-right">{l.distanceMm === null ? '—' : l.distanceMm.toFixed(1)}</td>
                  <td className="pr-4 text-[var(--muted)]">
                    {l.source === 'manual' ? 'by hand' : l.source === 'label' ? 'by label' : 'nearest'}
                    {l.sharedWith.length > 0 && <span className="text-warn"> · node shared with {l.sharedWith.join(', ')}</span>}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
      {canLead && Object.keys(edits).length > 0 && (
        <div className="flex flex-wrap items-center gap-3">
          <Button onClick={() => void save()} disabled={busy || badEdits.length > 0}>
            Save {Object.keys(edits).length} link{Object.keys(edits).length === 1 ? '' : 's'}
          </Button>
          {badEdits.length > 0 && <span className="text-sm text-bad">Not a node of this model: {badEdits.join(', ')}</span>}
        </div>
      )}
    </div>
  );
}

function ProposalView({ campaignId, campaign, detail, canLead }: { campaignId: string; campaign: Campaign; detail: FeModelDetail; canLead: boolean }) {
  const client = useQueryClient();
  const fail = useFailure();
  const toast = useToast();
  const top = detail.modes.at(-1)?.frequencyHz ?? 0;
  const [low, setLow] = useState('0');
  const [high, setHigh] = useState(String(Math.ceil(top)));
  const [axes, setAxes] = useState<string[]>(['Z']);
  const [sensors, setSensors] = useState(String(Math.min(detail.nodes.length, Math.max(6, 2 * detail.modes.length))));
  const [threshold, setThreshold] = useState('0.2');
  const [candidates, setCandidates] = useState<'nodes' | 'points'>('nodes');
  const [keepReference, setKeepReference] = useState(campaign.referenceDofs.length > 0);
  const [proposal, setProposal] = useState<FeProposal>();
  const [chosen, setChosen] = useState<Set<string>>(new Set());
  const [reference, setReference] = useState('');
  const [error, setError] = useState<string>();
  const [busy, setBusy] = useState(false);
  useEffect(() => setProposal(undefined), [detail.model.id]);

  async function propose() {
    setBusy(true);
    setError(undefined);
    try {
      const p = await api<FeProposal>(`/campaigns/${campaignId}/fe-models/${detail.model.id}/proposal`, { body: { bandHz: [Number(low), Number(high)], axes, sensors: Number(sensors), threshold: Number(threshold), candidates, ...(keepReference && campaign.referenceDofs.length ? { keep: campaign.referenceDofs } : {}) } });
      setProposal(p);
      setChosen(new Set(p.kept.map((k) => k.dof)));
      // "Keep the current reference" means the sensor stays: the current reference is the default choice, the proposed one is marked.
      const current = keepReference ? p.kept.find((k) => campaign.referenceDofs.some((d) => d.toLowerCase() === k.dof.toLowerCase())) : undefined;
      setReference(current?.dof ?? p.reference.dof);
    } catch (err) {
      setProposal(undefined);
      setError(err instanceof ApiError ? err.message : 'The proposal failed.');
    } finally {
      setBusy(false);
    }
  }
  async function accept() {
    if (!proposal) return;
    setBusy(true);
    try {
      const r = await api<{ pointsAdded: number; pointsUpdated: number; referenceDofs: string[]; schedule: { added: number; removed: number }; channelNote: string | null }>(`/campaigns/${campaignId}/fe-models/${detail.model.id}/proposal/accept`, {
        body: { dofs: [...chosen], reference, campaignVersion: campaign.version },
      });
      await Promise.all([keys.points(campaignId), keys.schedule(campaignId), keys.campaign(campaignId), keys.channels(campaignId), feKeys.one(campaignId, detail.model.id)].map((queryKey) => client.invalidateQueries({ queryKey })));
      toast('ok', `Plan accepted: ${r.pointsAdded} point${r.pointsAdded === 1 ? '' : 's'} added, ${r.pointsUpdated} updated, reference ${r.referenceDofs.join(', ')}, ${r.schedule.added} schedule entr${r.schedule.added === 1 ? 'y' : 'ies'} added.${r.channelNote ? ` ${r.channelNote}` : ''}`);
    } catch (err) {
      fail(err, [keys.campaign(campaignId)]);
    } finally {
      setBusy(false);
    }
  }
  const toggleAxis = (a: string) => setAxes(axes.includes(a) ? axes.filter((x) => x !== a) : [...axes, a]);
  const above = proposal?.autoMac.maxOffDiagonal && proposal.autoMac.maxOffDiagonal.value >= proposal.autoMac.threshold;

  return (
    <div className="space-y-3" data-testid="model-proposal">
      <h3 className="text-sm font-semibold">Where to measure: a proposal from the model</h3>
      <div className="grid gap-3 sm:grid-cols-3 lg:grid-cols-6">
        <Field id="band-low" label="Band from (Hz)" type="number" min={0} step="any" value={low} onChange={(e) => setLow(e.target.value)} />
        <Field id="band-high" label="Band to (Hz)" type="number" min={0} step="any" value={high} onChange={(e) => setHigh(e.target.value)} />
        <Field id="sensors" label="DOFs to keep" type="number" min={1} step={1} value={sensors} onChange={(e) => setSensors(e.target.value)} />
        <Field id="threshold" label="Auto-MAC threshold" hint="0.2 is common practice" type="number" min={0} max={1} step="0.05" value={threshold} onChange={(e) => setThreshold(e.target.value)} />
        <label className="flex flex-col gap-1 text-sm">
          <span className="font-medium">Candidates</span>
          <select className="min-h-10 rounded-md border border-[var(--line)] bg-[var(--panel)] px-2" value={candidates} onChange={(e) => setCandidates(e.target.value as 'nodes' | 'points')}>
            <option value="nodes">model nodes</option>
            <option value="points">the campaign’s linked points</option>
          </select>
        </label>
        <fieldset className="flex flex-col gap-1 text-sm">
          <legend className="font-medium">Axes</legend>
          <div className="flex min-h-10 items-center gap-3">
            {['X', 'Y', 'Z'].map((a) => (
              <label key={a} className="flex items-center gap-1">
                <input type="checkbox" checked={axes.includes(a)} onChange={() => toggleAxis(a)} /> {a}
              </label>
            ))}
          </div>
        </fieldset>
      </div>
      {campaign.referenceDofs.length > 0 && (
        <label className="flex items-center gap-2 text-sm">
          <input type="checkbox" checked={keepReference} onChange={(e) => setKeepReference(e.target.checked)} /> Always keep the current reference {campaign.referenceDofs.join(', ')} (a sensor already placed)
        </label>
      )}
      <Button variant="secondary" onClick={() => void propose()} disabled={busy || axes.length === 0}>
        Propose
      </Button>
      {error && <Notice tone="error">{error}</Notice>}
      {proposal && (
        <div className="space-y-3" data-testid="proposal-result">
          <p className="text-sm">
            {proposal.modes.length} mode{proposal.modes.length === 1 ? '' : 's'} of interest ({proposal.modes.map((m) => `${m.number}: ${m.frequencyHz.toFixed(1)} Hz`).join(', ')}); {proposal.kept.length} of {proposal.candidates.count} candidate DOFs kept, holding{' '}
            <span className="num">{(100 * proposal.informationKept).toFixed(1)} %</span> of the information (det of the Fisher matrix).
          </p>
          <Notice tone="info">{proposal.referenceWords}</Notice>
          {above ? <Notice tone="error">{proposal.autoMac.words}</Notice> : <Notice tone="ok">{proposal.autoMac.words}</Notice>}
          <div className="grid gap-4 lg:grid-cols-2">
            <div className="max-h-96 min-w-0 overflow-auto">
              <table className="text-sm" data-testid="proposal-table">
                <thead className="sticky top-0 bg-[var(--panel)]">
                  <tr className="text-left text-[var(--muted)]">
                    <th className="pr-3 font-medium">Keep</th>
                    <th className="pr-3 font-medium">Rank</th>
                    <th className="pr-3 font-medium">DOF</th>
                    <th className="pr-3 text-right font-medium">E_D</th>
                    <th className="pr-3 text-right font-medium">x, y, z (mm)</th>
                    <th className="pr-3 font-medium">Reference</th>
                  </tr>
                </thead>
                <tbody>
                  {proposal.kept.map((k) => (
                    <tr key={k.dof} className="border-t border-[var(--line)]">
                      <td className="pr-3 py-1">
                        <input
                          type="checkbox"
                          aria-label={`Keep ${k.dof}`}
                          checked={chosen.has(k.dof)}
                          disabled={!canLead}
                          onChange={() => {
                            const next = new Set(chosen);
                            if (next.has(k.dof)) next.delete(k.dof);
                            else next.add(k.dof);
                            setChosen(next);
                          }}
                        />
                      </td>
                      <td className="num pr-3">{k.rank}</td>
                      <td className="num pr-3">{k.dof}</td>
                      <td className="num pr-3 text-right">{k.ed.toFixed(3)}</td>
                      <td className="num pr-3 text-right">
                        {k.x.toFixed(0)}, {k.y.toFixed(0)}, {k.z.toFixed(0)}
                      </td>
                      <td className="pr-3">
                        <input type="radio" name="reference" aria-label={`Reference at ${k.dof}`} checked={reference === k.dof} disabled={!canLead} onChange={() => setReference(k.dof)} />
                        {proposal.reference.dof === k.dof && <span className="ml-1 text-xs text-[var(--muted)]">proposed</span>}
                      </td>
                    </tr>
                  ))}
                </tbody>
              </table>
              <p className="mt-1 text-xs text-[var(--muted)]">E_D: each DOF’s share of the modes’ independence (Kammer 1991); the kept ones sum to the number of modes.</p>
            </div>
            <div className="min-w-0">
              <h4 className="mb-1 text-sm font-medium">Auto-MAC of the kept DOFs</h4>
              <MacMatrix
                matrix={proposal.autoMac.matrix}
                rows={proposal.modes.map((m) => ({ name: `mode ${m.number} (${m.frequencyHz.toFixed(1)} Hz)`, short: String(m.number) }))}
                columns={proposal.modes.map((m) => ({ name: `mode ${m.number} (${m.frequencyHz.toFixed(1)} Hz)`, short: String(m.number) }))}
                rowTitle="model mode (number)"
                columnTitle="model mode (number)"
                label={`Auto-MAC of ${proposal.modes.length} model modes over the kept DOFs, from 0 to 1`}
                className="matrix-heatmap"
              />
            </div>
          </div>
          {canLead && (
            <div className="flex flex-wrap items-center gap-3">
              <Button onClick={() => void accept()} disabled={busy || chosen.size === 0 || !reference}>
                Accept into geometry and schedule
              </Button>
              <span className="text-xs text-[var(--muted)]">
                Adds missing points at their node’s coordinates with the chosen directions, sets the reference to {reference || '—'} and builds the schedule ({campaign.testType === 'roving-hammer' ? 'accelerometer at the reference, the hammer visits each DOF' : 'hammer at the reference, the accelerometer visits each DOF'}).
              </span>
            </div>
          )}
        </div>
      )}
    </div>
  );
}

export function ModelSection({ campaignId, campaign, canLead }: { campaignId: string; campaign: Campaign; canLead: boolean }) {
  const client = useQueryClient();
  const fail = useFailure();
  const list = useFeModels(campaignId);
  const [picked, setPicked] = useState<string>();
  const selected = picked ?? list.data?.models[0]?.id;
  const detail = useFeModel(campaignId, selected);

  async function remove(id: string, label: string) {
    if (!window.confirm(`Delete model version ${label} with its map? The audit trail keeps a record.`)) return;
    try {
      await api(`/campaigns/${campaignId}/fe-models/${id}`, { method: 'DELETE' });
      if (picked === id) setPicked(undefined);
      await client.invalidateQueries({ queryKey: feKeys.list(campaignId) });
    } catch (err) {
      fail(err);
    }
  }

  return (
    <Panel title="Model">
      <div className="space-y-5" data-testid="model-section">
        {canLead && <ModelUpload campaignId={campaignId} onUploaded={setPicked} />}
        {list.isPending && <Spinner label="Loading the model versions…" />}
        {list.isError && <Notice tone="error">The model versions could not be loaded: {list.error.message}</Notice>}
        {list.data && list.data.models.length === 0 && <p className="text-sm text-[var(--muted)]">No finite-element model in this campaign yet.{canLead ? ' Upload one above to plan points and reference from it.' : ''}</p>}
        {list.data && list.data.models.length > 0 && (
          <div className="overflow-x-auto">
            <table className="text-sm" data-testid="model-versions">
              <thead>
                <tr className="text-left text-[var(--muted)]">
                  <th className="pr-4 font-medium">Version</th>
                  <th className="pr-4 font-medium">Name</th>
                  <th className="pr-4 text-right font-medium">Nodes</th>
                  <th className="pr-4 text-right font-medium">Modes</th>
                  <th className="pr-4 font-medium">File units</th>
                  <th className="pr-4 font-medium">Shapes</th>
                  <th className="pr-4 font-medium">Uploaded</th>
                  <th />
                </tr>
              </thead>
              <tbody>
                {list.data.models.map((m) => (
                  <tr key={m.id} className={`border-t border-[var(--line)] ${m.id === selected ? 'bg-accent-soft/40' : ''}`}>
                    <td className="pr-4 py-1">
                      <button type="button" className="font-medium text-accent-strong hover:underline" onClick={() => setPicked(m.id)} aria-pressed={m.id === selected}>
                        {m.versionLabel}
                      </button>
                    </td>
                    <td className="pr-4">{m.name}</td>
                    <td className="num pr-4 text-right">{m.nodeCount}</td>
                    <td className="num pr-4 text-right">{m.modeCount}</td>
                    <td className="num pr-4">
                      {m.fileUnits.length}, {m.fileUnits.frequency}, {m.fileUnits.mass}
                    </td>
                    <td className="pr-4">{m.normalisation === 'mass' ? 'mass-normalised' : 'any scale'}</td>
                    <td className="num pr-4">{formatWhen(m.uploadedAt)}</td>
                    <td className="whitespace-nowrap">
                      <a className="text-sm text-accent-strong hover:underline" href={`/api/campaigns/${campaignId}/fe-models/${m.id}/source`}>
                        File
                      </a>
                      {canLead && (
                        <button type="button" className="ml-3 text-sm text-bad hover:underline" onClick={() => void remove(m.id, m.versionLabel)}>
                          Delete
                        </button>
                      )}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        )}
        {detail.isPending && selected && <Spinner label="Loading the model…" />}
        {detail.isError && <Notice tone="error">The model could not be loaded: {detail.error.message}</Notice>}
        {detail.data && (
          <>
            <p className="text-sm text-[var(--muted)]">
              Modes of {detail.data.model.versionLabel}: <span className="num">{detail.data.modes.map((m) => `${m.frequencyHz.toFixed(1)}`).join(', ')}</span> Hz.
            </p>
            <MapTable campaignId={campaignId} detail={detail.data} canLead={canLead} />
            <ProposalView campaignId={campaignId} campaign={campaign} detail={detail.data} canLead={canLead} />
          </>
        )}
      </div>
    </Panel>
  );
}

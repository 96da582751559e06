// One note per DOF in a list: its thumbnail (never the full photo, which opens on a click), who
// left it and when, and — for its author or a lead — Edit and Delete. An edit carries the version
// that was shown; when someone changed the note meanwhile the list reloads and says so (409).
import { useState } from 'react';
import { useQueryClient } from '@tanstack/react-query';
import { NOTE_TOPIC_NAMES, noteTopics, type NoteTopic } from '@resonote/contracts';
import { api } from '../../lib/api.ts';
import { formatWhen } from '../../lib/format-date.ts';
import { labKeys, photoUrl, thumbnailUrl, type DofNote } from '../../lib/lab-data.ts';
import { useFailure } from '../../lib/mutation.ts';
import { useToast } from '../../lib/toast.tsx';
import { Button } from '../ui.tsx';

/** Who may change notes here: the signed-in user's id and whether they lead the campaign; null to only read. */
export type NoteEditor = { userId: string; lead: boolean } | null;

function Photo({ campaignId, note }: { campaignId: string; note: DofNote }) {
  if (!note.photo) return null;
  const alt = `Photo at ${note.responseDof} / ${note.excitationDof}${note.text ? `: ${note.text.slice(0, 60)}` : ''}`;
  return (
    <a href={photoUrl(campaignId, note.id)} target="_blank" rel="noreferrer" className="shrink-0" title="Open the photo full size">
      {note.photo.thumbnail ? (
        <img src={thumbnailUrl(campaignId, note.id)} alt={alt} className="h-16 w-20 rounded border border-[var(--line)] object-cover" loading="lazy" data-testid="note-photo" />
      ) : (
        // No thumbnail came with this photo: name it instead of loading the whole file into the list.
        <span className="flex h-16 w-20 flex-col items-center justify-center rounded border border-dashed border-[var(--line)] text-center text-[11px] leading-tight text-accent" data-testid="note-photo-link">
          <span aria-hidden>▣</span> photo <span className="num">{(note.photo.size / 1024 / 1024).toFixed(1)} MB</span>
        </span>
      )}
    </a>
  );
}

export function NoteItem({ campaignId, note, editor }: { campaignId: string; note: DofNote; editor: NoteEditor }) {
  const client = useQueryClient();
  const toast = useToast();
  const fail = useFailure();
  const [mode, setMode] = useState<'read' | 'edit' | 'delete'>('read');
  const [topic, setTopic] = useState<NoteTopic>(note.topic);
  const [text, setText] = useState(note.text);
  const [busy, setBusy] = useState(false);
  const mayChange = editor !== null && (editor.lead || editor.userId === note.authorId);
  const reload = () => client.invalidateQueries({ queryKey: labKeys.notes(campaignId) });

  async function act(call: () => Promise<unknown>, done: string) {
    setBusy(true);
    try {
      await call();
      await reload();
      toast('ok', done);
      setMode('read');
    } catch (err) {
      fail(err, [labKeys.notes(campaignId)]);
      setMode('read');
    } finally {
      setBusy(false);
    }
  }
  const save = () => act(() => api(`/campaigns/${campaignId}/notes/${note.id}`, { method: 'PATCH', body: { topic, text, version: note.version } }), 'Note changed.');
  const remove = () => act(() => api(`/campaigns/${campaignId}/notes/${note.id}?version=${note.version}`, { method: 'DELETE' }), 'Note deleted.');

  return (
    <li className="flex gap-3 rounded-md border border-[var(--line)] p-2 text-sm" data-testid="note" data-note-id={note.id}>
      <Photo campaignId={campaignId} note={note} />
      <div className="min-w-0 flex-1 space-y-1">
        <p className="text-xs text-[var(--muted)]">
          <span className="font-medium text-[var(--ink)]">{NOTE_TOPIC_NAMES[note.topic]}</span> · {note.authorName ?? 'someone no longer here'} · {formatWhen(note.createdAt)}
          {note.editedAt && <span data-testid="note-edited"> · edited {formatWhen(note.editedAt)}</span>}
        </p>
        {mode === 'edit' ? (
          <form
            className="space-y-2"
            aria-label="Edit this note"
            onSubmit={(e) => {
              e.preventDefault();
              void save();
            }}
          >
            <select aria-label="Topic" value={topic} onChange={(e) => setTopic(e.target.value as NoteTopic)} className="min-h-10 rounded-md border border-[var(--line)] bg-[var(--panel)] px-2 text-sm">
              {noteTopics.map((t) => (
                <option key={t} value={t}>
                  {NOTE_TOPIC_NAMES[t]}
                </option>
              ))}
            </select>
            <textarea aria-label="Note" value={text} onChange={(e) => setText(e.target.value)} maxLength={2000} rows={3} className="w-full rounded-md border border-[var(--line)] bg-[var(--panel)] p-2 text-sm" data-testid="note-edit-text" />
            <div className="flex gap-2">
              <Button type="submit" disabled={busy || (!text.trim() && !note.photo)} data-testid="note-edit-save">
                {busy ? 'Saving…' : 'Save'}
              </Button>
              <Button type="button" variant="secondary" disabled={busy} onClick={() => setMode('read')}>
                Cancel
              </Button>
            </div>
          </form>
        ) : note.text ? (
          <p className="break-words whitespace-pre-wrap">{note.text}</p>
        ) : (
          <p className="text-[var(--muted)] italic">Photo only.</p>
        )}
        {mode === 'delete' && (
          <div className="flex flex-wrap items-center gap-2 rounded-md bg-bad/10 px-2 py-1.5 text-xs" role="alert">
            <span>Delete this note{note.photo ? ' and its photo' : ''}? The audit trail keeps what it said.</span>
            <Button variant="secondary" className="min-h-9 text-bad" disabled={busy} onClick={() => void remove()} data-testid="note-delete-confirm">
              Delete
            </Button>
            <Button variant="ghost" className="min-h-9" disabled={busy} onClick={() => setMode('read')}>
              Keep it
            </Button>
          </div>
        )}
        {mayChange && mode === 'read' && (
          <div className="flex gap-1">
            <Button
              variant="ghost"
              className="min-h-9 px-2 text-xs"
              onClick={() => {
                setTopic(note.topic);
                setText(note.text);
                setMode('edit');
              }}
              data-testid="note-edit"
            >
              Edit
            </Button>
            <Button variant="ghost" className="min-h-9 px-2 text-xs text-bad" onClick={() => setMode('delete')} data-testid="note-delete">
              Delete
            </Button>
          </div>
        )}
      </div>
    </li>
  );
}

// Notes and photos per DOF: a compact button with the count on Tap that opens a side panel (so
// the FRF keeps its place), the list with small photos on Review, and the form to add one. Edit and
// delete (note-item.tsx) are the same on both screens.
import { useEffect, useMemo, useRef, useState, type FormEvent } from 'react';
import { useQueryClient } from '@tanstack/react-query';
import { NOTE_TOPIC_NAMES, noteTopics, PHOTO_MAX_BYTES, type NoteTopic } from '@resonote/contracts';
import { labKeys, postNote, useNotes, type DofNote } from '../../lib/lab-data.ts';
import { newIdempotencyKey } from '../../lib/hits-data.ts';
import { makeThumbnail } from '../../lib/photo-thumbnail.ts';
import { useMe } from '../../lib/session.ts';
import { NoteItem, type NoteEditor } from './note-item.tsx';
import { useChannels, useKit } from '../../lib/campaign-data.ts';
import { useFailure } from '../../lib/mutation.ts';
import { useToast } from '../../lib/toast.tsx';
import { Button, Notice, Spinner } from '../ui.tsx';

const MB = PHOTO_MAX_BYTES / 1024 / 1024;

/** The notes of one schedule entry, oldest first, each with its photo's thumbnail (the full photo opens on a click). */
export function NoteList({ campaignId, notes, editor = null }: { campaignId: string; notes: DofNote[]; editor?: NoteEditor }) {
  if (!notes.length) return <p className="text-sm text-[var(--muted)]">No notes at this DOF.</p>;
  return (
    <ul className="space-y-2" data-testid="note-list">
      {notes.map((n) => (
        <NoteItem key={`${n.id}:${n.version}`} campaignId={campaignId} note={n} editor={editor} />
      ))}
    </ul>
  );
}

function NoteForm({ campaignId, entryId, tips, onSaved }: { campaignId: string; entryId: string; tips: string[]; onSaved: () => void }) {
  const client = useQueryClient();
  const toast = useToast();
  const fail = useFailure();
  const [topic, setTopic] = useState<NoteTopic>('sensor-mounting');
  const [text, setText] = useState('');
  const [photo, setPhoto] = useState<File | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  // One key per note: kept while the same note is retried after a failure, new once it is stored or changed.
  const pending = useRef<{ what: string; key: string } | null>(null);

  async function send(note: { topic: NoteTopic; text: string; photo: File | null }) {
    setBusy(true);
    const what = `${entryId}\n${note.topic}\n${note.text}\n${note.photo ? `${note.photo.name}:${note.photo.size}:${note.photo.lastModified}` : ''}`;
    if (pending.current?.what !== what) pending.current = { what, key: newIdempotencyKey() };
    try {
      const thumbnail = note.photo ? await makeThumbnail(note.photo) : null;
      const answer = await postNote(campaignId, entryId, { ...note, thumbnail }, pending.current.key);
      pending.current = null;
      await client.invalidateQueries({ queryKey: labKeys.notes(campaignId) });
      toast('ok', answer.replayed ? 'This note was already saved at this DOF.' : 'Note saved at this DOF.');
      setText('');
      setPhoto(null);
      onSaved();
    } catch (err) {
      fail(err);
    } finally {
      setBusy(false);
    }
  }
  function submit(e: FormEvent) {
    e.preventDefault();
    if (!text.trim() && !photo) return setError('Write a note or attach a photo.');
    if (photo && photo.size > PHOTO_MAX_BYTES) return setError(`The photo is ${(photo.size / 1024 / 1024).toFixed(1)} MB; at most ${MB} MB.`);
    setError(null);
    void send({ topic, text, photo });
  }
  return (
    <form onSubmit={submit} className="space-y-2" aria-label="Add a note at this DOF" noValidate>
      {tips.length > 0 && (
        <div className="flex flex-wrap items-center gap-1.5 text-xs">
          <span className="text-[var(--muted)]">Tip fitted:</span>
          {tips.map((t) => (
            <button key={t} type="button" disabled={busy} onClick={() => void send({ topic: 'tip', text: `Tip fitted: ${t}`, photo: null })} className="min-h-8 rounded-full border border-[var(--line)] px-2.5 hover:border-accent disabled:opacity-60" data-testid="tip-choice">
              {t}
            </button>
          ))}
        </div>
      )}
      <div className="flex flex-wrap gap-2">
        <label className="sr-only" htmlFor="note-topic">
          Topic
        </label>
        <select id="note-topic" value={topic} onChange={(e) => setTopic(e.target.value as NoteTopic)} className="min-h-10 rounded-md border border-[var(--line)] bg-[var(--panel)] px-2 text-sm">
          {noteTopics.map((t) => (
            <option key={t} value={t}>
              {NOTE_TOPIC_NAMES[t]}
            </option>
          ))}
        </select>
        <label className="inline-flex min-h-10 cursor-pointer items-center rounded-md border border-[var(--line)] px-3 text-sm hover:border-accent">
          {photo ? `Photo: ${photo.name.slice(0, 24)}` : 'Add photo…'}
          <input type="file" accept="image/jpeg,image/png,image/webp" className="sr-only" onChange={(e) => setPhoto(e.target.files?.[0] ?? null)} data-testid="note-photo-input" />
        </label>
      </div>
      <label className="sr-only" htmlFor="note-text">
        Note
      </label>
      <textarea id="note-text" value={text} onChange={(e) => setText(e.target.value)} maxLength={2000} rows={3} placeholder="Sensor mounting, the tip, anything odd…" className="w-full rounded-md border border-[var(--line)] bg-[var(--panel)] p-2 text-sm" />
      {error && <p className="text-xs text-bad">{error}</p>}
      <p className="text-xs text-[var(--muted)]">Photos: JPEG, PNG or WebP up to {MB} MB.</p>
      <Button type="submit" disabled={busy} data-testid="note-save">
        {busy ? 'Saving…' : 'Save note'}
      </Button>
    </form>
  );
}

/**
 * Who may change notes on this screen (Tap and Review alike): null to only read; else the signed-in
 * user, who may edit and delete their own notes, and every note when they lead the campaign.
 */
function useNoteEditor(canAct: boolean, isLead: boolean): NoteEditor {
  const me = useMe();
  return canAct && me.data ? { userId: me.data.user.id, lead: isLead } : null;
}

/** Tap: "Notes (n)" with a camera mark when a photo is there; opens a panel over the side of the page. */
export function DofNotesButton({ campaignId, entryId, canAct, isLead = false }: { campaignId: string; entryId: string; canAct: boolean; isLead?: boolean }) {
  const notes = useNotes(campaignId);
  const editor = useNoteEditor(canAct, isLead);
  // The tips registered for the hammer on the channel map (Kit, or the lab inventory it came from).
  const kit = useKit(campaignId);
  const channels = useChannels(campaignId);
  const hammerId = channels.data?.channels.find((c) => c.kind === 'hammer')?.kitItemId;
  const tips = kit.data?.items.find((i) => i.id === hammerId)?.tips ?? [];
  const [open, setOpen] = useState(false);
  const here = useMemo(() => (notes.data?.notes ?? []).filter((n) => n.entryId === entryId), [notes.data, entryId]);
  const photos = here.filter((n) => n.photo).length;
  useEffect(() => setOpen(false), [entryId]);
  useEffect(() => {
    if (!open) return;
    const onKey = (e: KeyboardEvent) => e.key === 'Escape' && setOpen(false);
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  }, [open]);
  return (
    <>
      <Button variant="secondary" onClick={() => setOpen(true)} className="min-h-9 px-3 text-xs" data-testid="notes-button" aria-haspopup="dialog">
        <span aria-hidden>✎</span> Notes <span className="num">({here.length})</span>
        {photos > 0 && (
          <span className="num" title={`${photos} photo${photos === 1 ? '' : 's'}`}>
            <span aria-hidden>▣</span> {photos}
            <span className="sr-only"> photos</span>
          </span>
        )}
      </Button>
      {open && (
        <div className="fixed inset-0 z-40 flex justify-end bg-black/30" onClick={() => setOpen(false)}>
          <aside role="dialog" aria-modal="true" aria-label="Notes at this DOF" className="h-full w-full max-w-md space-y-3 overflow-y-auto border-l border-[var(--line)] bg-[var(--panel)] p-4 shadow-xl" onClick={(e) => e.stopPropagation()} data-testid="notes-panel">
            <div className="flex items-center justify-between">
              <h2 className="text-base font-semibold">Notes at this DOF</h2>
              <Button variant="ghost" onClick={() => setOpen(false)} aria-label="Close the notes">
                ✕
              </Button>
            </div>
            {notes.isPending && <Spinner label="Loading the notes…" />}
            {notes.isError && <Notice tone="error">The notes could not be loaded: {notes.error.message}</Notice>}
            {notes.data && <NoteList campaignId={campaignId} notes={here} editor={editor} />}
            {canAct && <NoteForm campaignId={campaignId} entryId={entryId} tips={tips} onSaved={() => undefined} />}
          </aside>
        </div>
      )}
    </>
  );
}

/** Review: the notes of one entry inline; their author (and a lead) edit and delete them here as on Tap. */
export function DofNotesSection({ campaignId, entryId, canAct = false, isLead = false }: { campaignId: string; entryId: string; canAct?: boolean; isLead?: boolean }) {
  const notes = useNotes(campaignId);
  const editor = useNoteEditor(canAct, isLead);
  const here = (notes.data?.notes ?? []).filter((n) => n.entryId === entryId);
  return (
    <section className="space-y-2" data-testid="review-notes">
      <h4 className="text-sm font-semibold">
        Notes <span className="num font-normal text-[var(--muted)]">({here.length})</span>
      </h4>
      {notes.isPending && <Spinner label="Loading the notes…" />}
      {notes.isError && <Notice tone="error">The notes could not be loaded: {notes.error.message}</Notice>}
      {notes.data && <NoteList campaignId={campaignId} notes={here} editor={editor} />}
    </section>
  );
}

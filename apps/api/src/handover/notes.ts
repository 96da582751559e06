// Notes and photos per DOF in the hand-over: each note with its DOF, topic, author and time, and
// its photo as a small picture embedded in the report (the stored file, scaled by the page; a
// photo over REPORT_PHOTO_MAX_BYTES is named, not embedded, to keep the report file small).
import { NOTE_TOPIC_NAMES, type NoteTopic } from '@resonote/contracts';
import type { Db } from '@resonote/db/client';
import { notesOf, photoOf, thumbnailOf } from '../routes/notes.ts';
import { esc } from './svg-frame.ts';

export const REPORT_PHOTO_MAX_BYTES = 1.5 * 1024 * 1024;

export interface HandoverNote {
  id: string;
  excitationDof: string;
  responseDof: string;
  topic: NoteTopic;
  text: string;
  authorName: string | null;
  createdAt: Date;
  photo: { mime: string; size: number; dataUri: string | null } | null;
}

export async function notesForHandover(db: Db, campaignId: string): Promise<HandoverNote[]> {
  const notes = await notesOf(db, campaignId);
  const out: HandoverNote[] = [];
  for (const n of notes) {
    let photo: HandoverNote['photo'] = null;
    if (n.photo) {
      const small = n.photo.size <= REPORT_PHOTO_MAX_BYTES;
      // The thumbnail when the photo came with one (a few tens of kB), else the stored file when small.
      const row = n.photo.thumbnail ? await thumbnailOf(db, campaignId, n.id) : small ? await photoOf(db, campaignId, n.id) : null;
      photo = { mime: n.photo.mime, size: n.photo.size, dataUri: row ? `data:${row.mime};base64,${Buffer.from(row.bytes).toString('base64')}` : null };
    }
    out.push({ id: n.id, excitationDof: n.excitationDof, responseDof: n.responseDof, topic: n.topic as NoteTopic, text: n.text, authorName: n.authorName, createdAt: new Date(n.createdAt), photo });
  }
  return out;
}

/** The report's sub-section: one row per note, the photo as a thumbnail (about 32 × 24 mm). */
export function notesSectionHtml(notes: HandoverNote[]): string {
  const title = '<h3>Notes at the structure</h3>';
  if (!notes.length) return `${title}<p class="muted">No notes or photos were left at any DOF.</p>`;
  const rows = notes
    .map((n) => {
      const pic = n.photo ? (n.photo.dataUri ? `<img class="note-photo" src="${n.photo.dataUri}" alt="Photo at ${esc(n.responseDof)} / ${esc(n.excitationDof)}">` : `<span class="small">photo of ${(n.photo.size / 1024 / 1024).toFixed(1)} MB kept in the campaign (too large to embed)</span>`) : '';
      return `<tr><td class="n">${esc(n.responseDof)} / ${esc(n.excitationDof)}</td><td>${esc(NOTE_TOPIC_NAMES[n.topic] ?? n.topic)}</td><td>${n.text ? esc(n.text) : '<span class="muted">photo only</span>'}<div class="small">${esc(n.authorName ?? '—')}, ${esc(n.createdAt.toISOString().slice(0, 16).replace('T', ' '))} UTC</div></td><td>${pic}</td></tr>`;
    })
    .join('');
  return `${title}<table class="grid notes"><thead><tr><th>DOF (response / excitation)</th><th>Topic</th><th>Note</th><th>Photo</th></tr></thead><tbody>${rows}</tbody></table>`;
}

export const NOTES_CSS = `.note-photo { width: 32mm; height: 24mm; object-fit: cover; border: 0.2mm solid #c9d0ce; }
table.notes td { vertical-align: top; }`;

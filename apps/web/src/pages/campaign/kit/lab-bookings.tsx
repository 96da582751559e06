// Kit borrowed from the lab: book an inventory item for dates (it joins this campaign's Kit with
// its calibration history), see who else has it booked on overlapping dates, cancel a booking.
import { useMemo, useState, type FormEvent } from 'react';
import { Link } from 'react-router';
import { useQueryClient } from '@tanstack/react-query';
import { bookingCreateSchema } from '@resonote/contracts';
import { api } from '../../../lib/api.ts';
import { keys } from '../../../lib/campaign-data.ts';
import { issuesToErrors, type FieldErrors } from '../../../lib/forms.ts';
import { labKeys, useBookings, useLabItems, type Booking, type Overlap } from '../../../lib/lab-data.ts';
import { useFailure } from '../../../lib/mutation.ts';
import { useToast } from '../../../lib/toast.tsx';
import { Button, Field, Notice, Panel, Spinner } from '../../../components/ui.tsx';
import { Select } from '../../../components/form-controls.tsx';

const KIND = { hammer: 'Hammer', accelerometer: 'Accelerometer', conditioner: 'Conditioner' } as const;

function OverlapNote({ overlaps }: { overlaps: Overlap[] }) {
  if (!overlaps.length) return null;
  return (
    <p className="text-xs text-warn" data-testid="booking-overlap">
      <span aria-hidden>! </span>Also booked on overlapping dates:{' '}
      {overlaps.map((o, i) => (
        <span key={o.id}>
          {i > 0 && '; '}
          <span className="font-medium">{o.campaignName ?? o.otherCampaign}</span>
          {o.bookedByName ? ` (${o.bookedByName})` : ''} <span className="num">{o.fromOn} → {o.toOn}</span>
        </span>
      ))}
    </p>
  );
}

export function LabBookings({ campaignId, canLead }: { campaignId: string; canLead: boolean }) {
  const bookings = useBookings(campaignId);
  const lab = useLabItems();
  const client = useQueryClient();
  const toast = useToast();
  const fail = useFailure();
  const [errors, setErrors] = useState<FieldErrors>({});
  const [busy, setBusy] = useState(false);
  const [adding, setAdding] = useState(false);
  const available = useMemo(() => (lab.data?.items ?? []).filter((i) => !i.retired), [lab.data]);

  const refresh = () =>
    Promise.all([
      client.invalidateQueries({ queryKey: labKeys.bookings(campaignId) }),
      client.invalidateQueries({ queryKey: labKeys.items }),
      client.invalidateQueries({ queryKey: keys.kit(campaignId) }),
      client.invalidateQueries({ queryKey: labKeys.readiness(campaignId) }),
    ]);

  async function book(e: FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const f = new FormData(e.currentTarget);
    const parsed = bookingCreateSchema.safeParse({ labItemId: String(f.get('labItemId') ?? ''), fromOn: String(f.get('fromOn') ?? ''), toOn: String(f.get('toOn') ?? '') });
    if (!parsed.success) return setErrors(issuesToErrors(parsed.error));
    setErrors({});
    setBusy(true);
    try {
      const answer = await api<{ overlaps: Overlap[] }>(`/campaigns/${campaignId}/bookings`, { body: parsed.data });
      await refresh();
      toast(answer.overlaps.length ? 'info' : 'ok', answer.overlaps.length ? `Booked. It is also booked on overlapping dates by ${answer.overlaps.map((o) => o.campaignName ?? o.otherCampaign).join(', ')}; agree the hand-over with them.` : 'Booked; the item is in this campaign’s Kit.');
      setAdding(false);
    } catch (err) {
      fail(err);
    } finally {
      setBusy(false);
    }
  }

  async function cancel(b: Booking) {
    try {
      await api(`/campaigns/${campaignId}/bookings/${b.id}`, { method: 'DELETE' });
      await refresh();
      toast('ok', `Booking of ${b.model} (SN ${b.serial}) cancelled; the Kit keeps its copy.`);
    } catch (err) {
      fail(err);
    }
  }

  return (
    <Panel
      title={<>Borrowed from the lab kit <span className="num font-normal text-[var(--muted)]">({bookings.data?.bookings.length ?? 0})</span></>}
      actions={
        canLead &&
        !adding && (
          <Button variant="secondary" onClick={() => setAdding(true)} data-testid="book-item">
            Book an item
          </Button>
        )
      }
    >
      {adding && (
        <form onSubmit={book} noValidate className="mb-3 grid items-end gap-3 rounded-md border border-[var(--line)] p-3 sm:grid-cols-2 lg:grid-cols-[minmax(0,2fr)_minmax(0,1fr)_minmax(0,1fr)_auto]" aria-label="Book a lab kit item">
          {lab.isPending ? (
            <Spinner label="Loading the lab kit…" />
          ) : available.length === 0 ? (
            <p className="text-sm text-[var(--muted)]">
              The <Link to="/lab" className="text-accent underline">lab kit</Link> has nothing to book yet.
            </p>
          ) : (
            <Select id="book-item" name="labItemId" label="Item" options={available.map((i) => [i.id, `${KIND[i.kind]} ${i.model} (SN ${i.serial})`])} error={errors.labItemId} />
          )}
          <Field id="book-from" name="fromOn" type="date" label="Booked from" error={errors.fromOn} />
          <Field id="book-to" name="toOn" type="date" label="Booked until (inclusive)" error={errors.toOn} />
          <div className="flex gap-2">
            <Button type="submit" disabled={busy || available.length === 0} data-testid="book-save">
              Book
            </Button>
            <Button type="button" variant="ghost" onClick={() => setAdding(false)}>
              Cancel
            </Button>
          </div>
        </form>
      )}
      {bookings.isPending && <Spinner label="Loading the bookings…" />}
      {bookings.isError && <Notice tone="error">The bookings could not be loaded: {bookings.error.message}</Notice>}
      {bookings.data && bookings.data.bookings.length === 0 && (
        <p className="text-sm text-[var(--muted)]">
          Nothing booked from the <Link to="/lab" className="text-accent underline">lab kit</Link>. Items registered only in this campaign are listed above.
        </p>
      )}
      {bookings.data && bookings.data.bookings.length > 0 && (
        <ul className="space-y-2" data-testid="bookings">
          {bookings.data.bookings.map((b) => (
            <li key={b.id} className="flex flex-wrap items-start justify-between gap-2 border-b border-[var(--line)] pb-2 text-sm last:border-0">
              <div className="min-w-0">
                <p>
                  <span className="font-medium">
                    {KIND[b.kind]} {b.model}
                  </span>{' '}
                  <span className="num text-[var(--muted)]">SN {b.serial}</span> · <span className="num">{b.fromOn} → {b.toOn}</span>
                  {b.bookedByName && <span className="text-[var(--muted)]"> · booked by {b.bookedByName}</span>}
                </p>
                <OverlapNote overlaps={b.overlaps} />
              </div>
              {canLead && (
                <Button variant="ghost" onClick={() => void cancel(b)} className="min-h-8 px-2 text-xs">
                  Cancel booking
                </Button>
              )}
            </li>
          ))}
        </ul>
      )}
    </Panel>
  );
}

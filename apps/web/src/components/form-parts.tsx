// The pieces every form of the app ends or starts with: the submit and cancel buttons, and the
// notice that says why the last try failed.
import type { FormEvent, ReactNode } from 'react';
import { Button, Notice } from './ui.tsx';

/** Submit (disabled while busy, with its busy label) and Cancel. */
export function FormActions({ busy, submit, busyLabel, onCancel, cancelVariant = 'ghost', testId, className = 'flex items-end gap-2' }: { busy: boolean; submit: ReactNode; busyLabel?: string; onCancel?: () => void; cancelVariant?: 'ghost' | 'secondary'; testId?: string; className?: string }) {
  return (
    <div className={className}>
      <Button type="submit" disabled={busy} data-testid={testId}>
        {busy && busyLabel ? busyLabel : submit}
      </Button>
      {onCancel && (
        <Button type="button" variant={cancelVariant} onClick={onCancel}>
          Cancel
        </Button>
      )}
    </div>
  );
}

/** The failure of a form's last submit, across the whole row of its grid (`span`: a col-span class). */
export function FormFailure({ message, span }: { message: string | undefined; span: string }) {
  if (!message) return null;
  return (
    <div className={span}>
      <Notice tone="error">{message}</Notice>
    </div>
  );
}

/**
 * The last cell of a table row being edited in place: the row's form (its inputs point at it with
 * `form={id}`) with Save and Cancel.
 */
export function RowFormCell({ id, onSubmit, busy = false, onCancel, noValidate = true }: { id: string; onSubmit: (event: FormEvent<HTMLFormElement>) => void; busy?: boolean; onCancel: () => void; noValidate?: boolean }) {
  return (
    <td className="py-1 text-right whitespace-nowrap">
      <form id={id} onSubmit={onSubmit} noValidate={noValidate} className="inline-flex gap-1">
        <Button type="submit" className="min-h-9 px-3" disabled={busy}>
          Save
        </Button>
        <Button type="button" variant="ghost" className="min-h-9 px-2" onClick={onCancel}>
          Cancel
        </Button>
      </form>
    </td>
  );
}

// The app's list tables: a scrolling frame, one header row of column names, and the rows the page
// writes. The account's tokens, the campaigns list, a Kit's channel map and calibration records use it.
import type { ReactNode } from 'react';

/** A column heading: its text, or its text with its own classes (e.g. `text-right`). */
export type Column = ReactNode | { label: ReactNode; className: string };

const isStyled = (c: Column): c is { label: ReactNode; className: string } => typeof c === 'object' && c !== null && 'className' in c && 'label' in c;

export function DataTable({
  columns,
  children,
  table = 'w-full text-sm',
  head = 'text-left text-[var(--muted)]',
  th = 'py-2 pr-3 font-medium',
  body,
  frame = 'overflow-x-auto',
}: {
  columns: readonly Column[];
  children: ReactNode;
  /** Classes of the table, its header, each heading cell, the body and the scrolling frame. */
  table?: string;
  head?: string;
  th?: string;
  body?: string;
  frame?: string;
}) {
  return (
    <div className={frame}>
      <table className={table}>
        <thead className={head}>
          <tr>
            {columns.map((c, i) => (
              <th key={i} className={isStyled(c) ? c.className : th}>
                {isStyled(c) ? c.label : c}
              </th>
            ))}
          </tr>
        </thead>
        <tbody className={body}>{children}</tbody>
      </table>
    </div>
  );
}

import type { ReactNode } from 'react';

/** One column heading of a DataTable. */
export interface Column {
  /** Stable key (the heading's text when it is plain). */
  key: string;
  label: ReactNode;
  /** Numbers align right, so their digits line up. */
  right?: boolean;
  /** More classes for the heading, e.g. 'hidden sm:table-cell' for a column a phone drops. */
  className?: string;
}

/**
 * The house's list table: headings in small capitals, ruled rows, and a sideways scroll on a
 * narrow screen rather than a page wider than the phone. Rows come as children (`<tr>`s), so
 * each table keeps its own cells and data attributes.
 */
export function DataTable({
  columns,
  testId,
  gap = 'pr-4',
  nowrapHeadings = false,
  children,
}: {
  columns: readonly Column[];
  testId?: string;
  /** The right padding of each heading (cells set their own): 'pr-3' for dense numeric tables. */
  gap?: 'pr-3' | 'pr-4';
  nowrapHeadings?: boolean;
  /** The rows (`<tr>`s). */
  children?: ReactNode;
}) {
  const base = `pb-2 ${gap} font-medium${nowrapHeadings ? ' whitespace-nowrap' : ''}`;
  return (
    <div className="overflow-x-auto">
      <table className="w-full text-left text-sm" data-testid={testId}>
        <thead className="text-xs uppercase tracking-wider text-ink-faint">
          <tr>
            {columns.map((c) => (
              <th key={c.key} className={[base, c.right ? 'text-right' : '', c.className ?? ''].filter(Boolean).join(' ')}>
                {c.label}
              </th>
            ))}
          </tr>
        </thead>
        <tbody className="divide-y divide-paper-line">{children}</tbody>
      </table>
    </div>
  );
}

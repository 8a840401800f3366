import { useEffect, useRef, useState, type KeyboardEvent } from 'react';

export type CellVerdict = { ok: true; apply(): void } | { ok: false; message: string };

interface Props {
  /** the value as the document has it, formatted for editing */
  value: string;
  /** reads a typed text; `apply` commits it to the document */
  read(text: string): CellVerdict;
  /** an issue of the document at this field (e.g. from the spec schema) */
  issue?: string;
  cell: string;
  label: string;
  className?: string;
  placeholder?: string;
  muted?: boolean;
  title?: string;
  /** the value in the other unit, shown small under the cell (e.g. "2.000 in" under 50.8) */
  alt?: string;
}

/**
 * An always-editable table cell. What is typed is kept as a draft; each keystroke that reads as a
 * valid value is committed at once (so the drawing follows the typing), a text that does not read
 * stays in the cell with its message and changes nothing in the document. Escape restores the
 * document's value. Arrow up/down and Enter move between rows, like a spreadsheet.
 */
export function CellInput({ value, read, issue, cell, label, className = '', placeholder, muted, title, alt }: Props) {
  const [draft, setDraft] = useState<string | null>(null);
  const [error, setError] = useState<string | null>(null);
  const focused = useRef(false);
  // a new document value (undo, another edit) replaces a draft that was already committed
  useEffect(() => {
    if (!focused.current && error === null) setDraft(null);
  }, [value, error]);

  const onChange = (text: string) => {
    setDraft(text);
    const v = read(text);
    if (v.ok) {
      setError(null);
      v.apply();
    } else setError(v.message);
  };
  const onKeyDown = (e: KeyboardEvent<HTMLInputElement>) => {
    if (e.key === 'Escape') {
      setDraft(null);
      setError(null);
      return;
    }
    const col = cell.split(':')[1];
    const move = e.key === 'ArrowDown' || (e.key === 'Enter' && !e.shiftKey) ? 1 : e.key === 'ArrowUp' || (e.key === 'Enter' && e.shiftKey) ? -1 : 0;
    if (move === 0) return;
    e.preventDefault();
    // rows in the order shown (sorting changes it), not the document order
    const tr = e.currentTarget.closest('tr');
    const target = move > 0 ? tr?.nextElementSibling : tr?.previousElementSibling;
    const next = target?.querySelector<HTMLInputElement>(`[data-col="${col}"]`);
    next?.focus();
    next?.select();
  };
  const message = error ?? issue;
  return (
    <div className="relative">
      <input
        data-cell={cell}
        data-col={cell.split(':')[1]}
        aria-label={label}
        aria-invalid={message ? true : undefined}
        title={message ?? title}
        value={draft ?? value}
        placeholder={placeholder}
        onFocus={(e) => {
          focused.current = true;
          e.currentTarget.select();
        }}
        onBlur={() => {
          focused.current = false;
          if (error === null) setDraft(null);
        }}
        onChange={(e) => onChange(e.target.value)}
        onKeyDown={onKeyDown}
        className={`w-full rounded-sm border px-1.5 py-1 font-mono text-[15px] tabular-nums outline-none focus:border-plate-700 focus:ring-2 focus:ring-brass-500 ${
          message ? 'border-finding-error bg-red-50' : 'border-transparent hover:border-blast-200'
        } ${muted && draft === null ? 'italic text-plate-500' : ''} ${alt ? 'pb-0 pt-0.5' : ''} ${className}`}
      />
      {alt && (
        <span aria-hidden="true" className={`pointer-events-none block px-1.5 font-mono text-[12px] leading-[14px] tabular-nums text-plate-500 ${className.includes('text-right') ? 'text-right' : ''}`} data-alt-unit>
          {alt}
        </span>
      )}
      {error && (
        <p role="alert" className="absolute left-0 top-full z-20 mt-0.5 w-64 rounded bg-finding-error px-2 py-1 text-xs font-semibold text-white shadow">
          {error}
        </p>
      )}
    </div>
  );
}

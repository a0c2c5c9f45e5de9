import { useEffect, useState } from 'react';
import { Icon } from './icons';
import { Input } from './field';

/** A filter box that reports its value after the person stops typing. */
export function SearchInput({
  value,
  onChange,
  label,
  placeholder,
  delayMs = 300,
}: {
  value: string;
  onChange: (v: string) => void;
  label: string;
  placeholder?: string;
  delayMs?: number;
}) {
  const [draft, setDraft] = useState(value);
  useEffect(() => setDraft(value), [value]);
  useEffect(() => {
    if (draft === value) return;
    const t = setTimeout(() => onChange(draft), delayMs);
    return () => clearTimeout(t);
  }, [draft, value, onChange, delayMs]);
  return (
    <div className="relative w-full sm:w-72">
      <Icon name="search" className="pointer-events-none absolute top-1/2 left-3 -translate-y-1/2 text-fg-muted" />
      <Input type="search" aria-label={label} placeholder={placeholder ?? label} value={draft} onChange={(e) => setDraft(e.target.value)} className="pl-10" />
    </div>
  );
}

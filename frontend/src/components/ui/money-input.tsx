import { useState, type InputHTMLAttributes } from 'react';
import { currencyMinorDigits } from '@/lib/format';
import { UnitInput } from './field';

/**
 * Money typed in the currency's major unit (14.50) and kept as integer minor units (1450), as the API
 * stores it. An empty or unreadable entry is passed on as NaN so the form's schema reports it.
 */
export function MoneyInput({
  value,
  onChange,
  currency,
  ...rest
}: Omit<InputHTMLAttributes<HTMLInputElement>, 'value' | 'onChange'> & {
  value: number | undefined | null;
  onChange: (minor: number) => void;
  currency: string;
}) {
  const digits = currencyMinorDigits(currency);
  const [text, setText] = useState(() => (typeof value === 'number' && Number.isFinite(value) ? (value / 10 ** digits).toFixed(digits) : ''));
  return (
    <UnitInput
      {...rest}
      unit={currency}
      inputMode="decimal"
      value={text}
      onChange={(e) => {
        setText(e.target.value);
        const cleaned = e.target.value.trim().replace(/,/g, '');
        const major = cleaned === '' ? NaN : Number(cleaned);
        onChange(Number.isFinite(major) ? Math.round(major * 10 ** digits) : NaN);
      }}
    />
  );
}

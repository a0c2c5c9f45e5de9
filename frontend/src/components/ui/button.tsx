import type { ButtonHTMLAttributes, ComponentProps } from 'react';
import { Link } from 'react-router-dom';
import { variants, type VariantProps } from '@/lib/variants';
import { Spinner } from './spinner';

const buttonConfig = {
  variant: {
    primary: 'bg-primary text-primary-fg hover:bg-primary-hover border border-primary',
    secondary: 'bg-surface text-primary border border-line-strong hover:bg-primary-soft',
    ghost: 'bg-transparent text-primary border border-transparent hover:bg-primary-soft',
    danger: 'bg-critical text-white border border-critical hover:brightness-110',
  },
  size: {
    // phones get 44 px targets whatever the size; fine pointers may have the denser one
    sm: 'min-h-9 pointer-coarse:min-h-11 px-3 text-sm',
    md: 'min-h-11 px-4 text-base',
    lg: 'min-h-12 px-5 text-lg',
  },
};

export const buttonClasses = variants(
  'inline-flex items-center justify-center gap-2 rounded-lg font-bold transition-colors select-none disabled:cursor-not-allowed disabled:opacity-55',
  buttonConfig,
  { variant: 'primary', size: 'md' },
);

export type ButtonVariants = VariantProps<typeof buttonConfig>;

export function Button({
  variant,
  size,
  className,
  busy = false,
  disabled,
  children,
  type = 'button',
  ...rest
}: ButtonHTMLAttributes<HTMLButtonElement> & ButtonVariants & { busy?: boolean }) {
  return (
    <button type={type} className={buttonClasses({ variant, size, className })} disabled={disabled || busy} aria-busy={busy || undefined} {...rest}>
      {busy && <Spinner className="size-4" />}
      {children}
    </button>
  );
}

/** A link that looks like a button (navigation, not an action). */
export function ButtonLink({ variant, size, className, ...rest }: ComponentProps<typeof Link> & ButtonVariants) {
  return <Link className={buttonClasses({ variant, size, className })} {...rest} />;
}

import type { ButtonHTMLAttributes, ReactNode } from 'react';
import { Link, type LinkProps } from 'react-router-dom';

/** How a button reads: the one main action, a secondary one, a quiet one, or one that cannot be undone. */
export type ButtonVariant = 'primary' | 'secondary' | 'ghost' | 'danger';
/** `md` for forms and toolbars; `lg` for bench and scanning screens, where thumbs need room. */
export type ButtonSize = 'sm' | 'md' | 'lg';

const VARIANTS: Record<ButtonVariant, string> = {
  primary: 'bg-ink-900 text-white hover:bg-ink-800 disabled:bg-ink-400',
  secondary: 'bg-white text-ink-900 ring-1 ring-inset ring-ink-300 hover:bg-ink-50 disabled:text-ink-400',
  ghost: 'text-ink-700 hover:bg-ink-100 disabled:text-ink-400',
  danger: 'bg-stop-700 text-white hover:bg-stop-500 disabled:bg-ink-400',
};

const SIZES: Record<ButtonSize, string> = {
  sm: 'h-8 px-3 text-caption',
  md: 'h-10 px-4 text-body',
  lg: 'h-12 px-5 text-lead',
};

/**
 * The class list of a button of one variant and size, for elements that look like buttons but are
 * not (links, file pickers).
 */
export function buttonClass(variant: ButtonVariant = 'primary', size: ButtonSize = 'md', extra = ''): string {
  return `inline-flex items-center justify-center gap-2 rounded-md font-semibold whitespace-nowrap transition-colors disabled:cursor-not-allowed ${VARIANTS[variant]} ${SIZES[size]} ${extra}`.trim();
}

/** A button; `busy` disables it and shows `busyLabel` (or the label) while work runs. */
export function Button({
  variant = 'primary',
  size = 'md',
  busy = false,
  busyLabel,
  className = '',
  children,
  type = 'button',
  disabled,
  ...rest
}: ButtonHTMLAttributes<HTMLButtonElement> & {
  variant?: ButtonVariant;
  size?: ButtonSize;
  busy?: boolean;
  busyLabel?: ReactNode;
}) {
  return (
    <button type={type} disabled={disabled || busy} aria-busy={busy || undefined} className={buttonClass(variant, size, className)} {...rest}>
      {busy ? (busyLabel ?? children) : children}
    </button>
  );
}

/** A router link that looks like a button. */
export function ButtonLink({ variant = 'secondary', size = 'md', className = '', ...rest }: LinkProps & { variant?: ButtonVariant; size?: ButtonSize }) {
  return <Link className={buttonClass(variant, size, className)} {...rest} />;
}

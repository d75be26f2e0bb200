import type { ButtonHTMLAttributes } from 'react';

const LOOKS = {
  primary: 'bg-bracken text-chalk hover:bg-bracken-deep disabled:bg-bracken/50',
  quiet: 'bg-transparent text-tarn border-2 border-tarn/30 hover:border-tarn disabled:opacity-50',
} as const;

type ButtonProps = { look?: keyof typeof LOOKS } & ButtonHTMLAttributes<HTMLButtonElement>;

export function Button({ look = 'primary', className = '', type = 'button', ...rest }: ButtonProps) {
  return (
    <button
      type={type}
      className={`rounded-full px-5 py-2.5 text-sm font-semibold transition-colors disabled:cursor-not-allowed ${LOOKS[look]} ${className}`}
      {...rest}
    />
  );
}

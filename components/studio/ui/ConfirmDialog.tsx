'use client';
// A question that must be answered before something that cannot be taken back (deleting a groom,
// restoring a version over the current spec). Built on the browser's modal dialog, so focus stays
// inside it and Escape answers "no".
import { useEffect, useRef, type ReactNode } from 'react';
import { Button } from '@/components/ui/Button';

export function ConfirmDialog({
  open,
  title,
  children,
  confirmLabel,
  onConfirm,
  onCancel,
  busy = false,
  danger = false,
}: {
  open: boolean;
  title: string;
  children: ReactNode;
  confirmLabel: string;
  onConfirm: () => void;
  onCancel: () => void;
  busy?: boolean;
  danger?: boolean;
}) {
  const dialog = useRef<HTMLDialogElement>(null);
  useEffect(() => {
    const element = dialog.current;
    if (!element) return;
    if (open && !element.open) element.showModal();
    if (!open && element.open) element.close();
  }, [open]);
  return (
    <dialog
      ref={dialog}
      aria-labelledby="confirm-title"
      onCancel={(event) => {
        event.preventDefault();
        onCancel();
      }}
      className="m-auto max-w-md rounded-3xl bg-chalk p-0 text-loam shadow-2xl backdrop:bg-tarn-deep/60"
    >
      {open && (
        <div className="flex flex-col gap-4 p-6">
          <h2 id="confirm-title" className="text-xl font-extrabold tracking-tight">
            {title}
          </h2>
          <div className="text-loam-soft">{children}</div>
          <div className="flex justify-end gap-2">
            <Button look="quiet" onClick={onCancel} disabled={busy}>
              Keep it as it is
            </Button>
            <Button onClick={onConfirm} disabled={busy} className={danger ? 'bg-hawthorn hover:bg-hawthorn' : ''}>
              {busy ? 'Working…' : confirmLabel}
            </Button>
          </div>
        </div>
      )}
    </dialog>
  );
}

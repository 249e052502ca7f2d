import {
  cloneElement,
  isValidElement,
  useId,
  type ReactElement,
  type ReactNode,
  type ButtonHTMLAttributes,
  type InputHTMLAttributes,
  type SelectHTMLAttributes,
} from "react";
import type { Role } from "@/db/schema";
import { ROLE_LABELS } from "@/lib/authz/policy";

export function PageHeader({ title, subtitle, actions }: { title: string; subtitle?: ReactNode; actions?: ReactNode }) {
  return (
    <div className="mb-6 flex flex-wrap items-end justify-between gap-4 border-b border-rule pb-4">
      <div>
        <h1 className="text-2xl font-semibold tracking-tight">{title}</h1>
        {subtitle ? <p className="mt-1 text-sm text-muted">{subtitle}</p> : null}
      </div>
      {actions ? <div className="flex flex-wrap gap-2">{actions}</div> : null}
    </div>
  );
}

export function Sheet({ children, className = "" }: { children: ReactNode; className?: string }) {
  return <section className={`rounded-sm border border-rule bg-sheet p-5 shadow-[0_1px_0_rgba(0,0,0,0.03)] ${className}`}>{children}</section>;
}

export function Button({
  variant = "primary",
  className = "",
  ...rest
}: ButtonHTMLAttributes<HTMLButtonElement> & { variant?: "primary" | "quiet" | "danger" }) {
  const look = {
    primary: "bg-accent text-white hover:bg-[#163d6c] disabled:opacity-60",
    quiet: "border border-rule bg-sheet text-ink hover:bg-paper",
    danger: "border border-bad text-bad bg-sheet hover:bg-[#fbeeee]",
  }[variant];
  return <button className={`inline-flex items-center gap-2 rounded-sm px-3 py-1.5 text-sm font-medium ${look} ${className}`} {...rest} />;
}

/** A label bound by id (not by wrapping), so a select's options never leak into its accessible name. */
export function Field({
  label,
  hint,
  error,
  children,
}: {
  label: string;
  hint?: string;
  error?: string;
  children: ReactElement<{ id?: string; "aria-describedby"?: string }>;
}) {
  const id = useId();
  const hintId = `${id}-hint`;
  const control = isValidElement(children) ? cloneElement(children, { id, "aria-describedby": hint ? hintId : undefined }) : children;
  return (
    <div className="block text-sm">
      <label htmlFor={id} className="mb-1 block font-medium">
        {label}
      </label>
      {control}
      {hint ? (
        <span id={hintId} className="mt-1 block text-xs text-muted">
          {hint}
        </span>
      ) : null}
      {error ? (
        <span role="alert" className="mt-1 block text-xs text-bad">
          ✕ {error}
        </span>
      ) : null}
    </div>
  );
}

const inputLook = "w-full rounded-sm border border-rule bg-white px-2.5 py-1.5 text-sm focus:border-accent";
export const TextInput = (p: InputHTMLAttributes<HTMLInputElement>) => <input className={inputLook} {...p} />;
export const Select = (p: SelectHTMLAttributes<HTMLSelectElement>) => <select className={inputLook} {...p} />;

/** Status as text and a shape, never by colour alone. */
export function Notice({ ok, children }: { ok: boolean; children: ReactNode }) {
  return (
    <p role={ok ? "status" : "alert"} className={`mt-3 flex items-start gap-2 text-sm ${ok ? "text-good" : "text-bad"}`}>
      <span aria-hidden className="font-bold">
        {ok ? "✓" : "✕"}
      </span>
      <span>{children}</span>
    </p>
  );
}

/** What became of a save: the server's own message when refused, `saved` once it went through (nothing while pending). */
export function SaveOutcome({
  save,
  saved = "Saved.",
}: {
  save: { isError: boolean; isSuccess: boolean; isPending: boolean; error: Error | null };
  saved?: string;
}) {
  if (save.isError)
    return (
      <p role="alert" className="text-sm text-bad">
        <span aria-hidden>✕ </span>
        {save.error?.message}
      </p>
    );
  if (save.isSuccess && !save.isPending)
    return (
      <p role="status" className="text-sm text-good">
        <span aria-hidden>✓ </span>
        {saved}
      </p>
    );
  return null;
}

const ROLE_SHAPES: Record<Role, string> = { pi: "◆", author: "■", reviewer: "▲", viewer: "○" };

export function RoleBadge({ role }: { role: Role }) {
  return (
    <span className="inline-flex items-center gap-1 rounded-full border border-rule bg-paper px-2 py-0.5 text-xs font-medium">
      <span aria-hidden>{ROLE_SHAPES[role]}</span>
      {ROLE_LABELS[role]}
    </span>
  );
}

export function EmptyState({ title, children }: { title: string; children?: ReactNode }) {
  return (
    <div className="rounded-sm border border-dashed border-rule bg-sheet/60 p-8 text-center">
      <p className="font-medium">{title}</p>
      {children ? <div className="mt-2 text-sm text-muted">{children}</div> : null}
    </div>
  );
}

"use client";
import { useActionState, type ReactNode } from "react";
import type { ActionState } from "@/lib/http/action";
import { Notice } from "./ui";

type ServerAction = (prev: ActionState, form: FormData) => Promise<ActionState>;

/** A form bound to a server action, showing its answer next to the fields. */
export function ActionForm({
  action,
  children,
  className,
  hidden,
  render,
}: {
  action: ServerAction;
  children?: ReactNode;
  className?: string;
  hidden?: Record<string, string>;
  render?: (state: ActionState, pending: boolean) => ReactNode;
}) {
  const [state, formAction, pending] = useActionState(action, null);
  return (
    <form action={formAction} className={className} aria-busy={pending}>
      {hidden ? Object.entries(hidden).map(([k, v]) => <input key={k} type="hidden" name={k} value={v} />) : null}
      {children}
      {render ? render(state, pending) : null}
      {state?.message && !render ? <Notice ok={state.ok}>{state.message}</Notice> : null}
    </form>
  );
}

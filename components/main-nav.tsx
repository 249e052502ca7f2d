"use client";
import Link from "next/link";
import { usePathname } from "next/navigation";
import { useEffect, useRef, useState } from "react";
import type { ActionState } from "@/lib/http/action";
import { ActionForm } from "./action-form";
import { WaitingOnMeLink } from "./review/waiting-on-me-link";

const MENU_ID = "main-menu";

/**
 * The main navigation. From Tailwind's `sm` (640 px) up: one horizontal line. Below it: the brand,
 * the waiting-on-me count and a "Menu" button that opens the links and the sign-out form as a
 * vertical list; the list closes on navigation, on a link click and on Escape.
 */
export function MainNav({
  userName,
  userEmail,
  showOutbox,
  signOut,
}: {
  userName: string;
  userEmail: string;
  showOutbox: boolean;
  /** The sign-out server action (app/actions/auth), passed down from the server layout. */
  signOut: (prev: ActionState, form: FormData) => Promise<ActionState>;
}) {
  const pathname = usePathname();
  // The menu is open for the page it was opened on: any navigation closes it.
  const [openOn, setOpenOn] = useState<string | null>(null);
  const open = openOn !== null && openOn === pathname;
  const button = useRef<HTMLButtonElement>(null);

  useEffect(() => {
    if (!open) return;
    const onKey = (e: KeyboardEvent) => {
      if (e.key !== "Escape") return;
      setOpenOn(null);
      button.current?.focus();
    };
    document.addEventListener("keydown", onKey);
    return () => document.removeEventListener("keydown", onKey);
  }, [open]);

  const link = "py-2 hover:underline sm:py-0";
  return (
    <nav aria-label="Main" className="mx-auto flex max-w-6xl flex-wrap items-center gap-x-4 gap-y-2 px-4 py-3 text-sm sm:px-6 xl:gap-x-6">
      <Link href="/manuscripts" className="font-semibold uppercase tracking-[0.18em] text-accent">
        Prooflight
      </Link>
      <div className="ml-auto flex items-center gap-3 sm:hidden">
        <WaitingOnMeLink compact />
        <button
          ref={button}
          type="button"
          aria-expanded={open}
          aria-controls={MENU_ID}
          onClick={() => setOpenOn(open ? null : pathname)}
          className="inline-flex items-center gap-1.5 rounded-sm border border-rule px-2.5 py-1.5 hover:bg-paper"
        >
          <span aria-hidden className="text-base leading-none">
            {open ? "✕" : "☰"}
          </span>
          Menu
        </button>
      </div>
      <div
        id={MENU_ID}
        // A click on a link inside closes the list, even when it leads to the page already shown.
        onClick={(e) => {
          if ((e.target as HTMLElement).closest("a")) setOpenOn(null);
        }}
        className={`${open ? "flex" : "hidden"} w-full flex-col border-t border-rule pt-1 sm:flex sm:w-auto sm:flex-1 sm:flex-row sm:flex-wrap sm:items-center sm:gap-x-4 sm:gap-y-2 sm:border-0 sm:pt-0 xl:gap-x-6`}
      >
        <Link href="/manuscripts" className={link}>
          Manuscripts
        </Link>
        <span className={link}>
          <WaitingOnMeLink />
        </span>
        <Link href="/calculators" className={link}>
          Calculators
        </Link>
        <Link href="/settings/mail" className={link}>
          Mail settings
        </Link>
        <Link href="/settings/tokens" className={link}>
          API tokens
        </Link>
        {showOutbox ? (
          <Link href="/dev/mail" className={link}>
            Mail outbox
          </Link>
        ) : null}
        <span
          className="border-t border-rule py-2 break-all text-muted sm:ml-auto sm:border-0 sm:py-0 sm:break-normal"
          data-testid="signed-in-as"
          title={`${userName} · ${userEmail}`}
        >
          {/* From sm to xl the line is short of room: the name only there, the address on hover. */}
          {userName}
          <span className="sm:hidden xl:inline"> · {userEmail}</span>
        </span>
        <ActionForm action={signOut} className="pb-2 sm:pb-0">
          <button type="submit" className="rounded-sm border border-rule px-2 py-1 hover:bg-paper">
            Sign out
          </button>
        </ActionForm>
      </div>
    </nav>
  );
}

"use client";
import { createContext, useContext, useState, type ReactNode } from "react";
import { Button } from "@/components/ui";

/** Whether the panel's figure is signed off on its current hash (saving a revision makes that sign-off stale). */
export const SignedOffContext = createContext<{ signedOff: boolean; figureNumber: number } | null>(null);

/** The confirmation asked before saving a revision of a signed-off figure. */
function SignedOffWarning({ figureNumber, onConfirm, onCancel }: { figureNumber: number; onConfirm: () => void; onCancel: () => void }) {
  return (
    <div role="alert" className="rounded-sm border border-warn bg-[#fbf4e6] p-3 text-sm">
      <p className="font-semibold">
        <span aria-hidden>△ </span>Figure {figureNumber} is signed off.
      </p>
      <p className="mt-1 text-xs">
        A new revision changes the figure hash: the PI&apos;s sign-off goes stale and the figure needs signing off again. Approvals of this panel go stale too.
      </p>
      <div className="mt-2 flex flex-wrap gap-2">
        <Button type="button" onClick={onConfirm}>
          Save anyway
        </Button>
        <Button type="button" variant="quiet" onClick={onCancel}>
          Don&apos;t save
        </Button>
      </div>
    </div>
  );
}

/** Wraps a save: on a signed-off figure the first request asks (the warning to show), the confirmation saves. */
export function useSignedOffGuard(save: () => void): { request: () => void; warning: ReactNode } {
  const ctx = useContext(SignedOffContext);
  const [asking, setAsking] = useState(false);
  const request = () => (ctx?.signedOff ? setAsking(true) : save());
  const warning =
    asking && ctx ? (
      <SignedOffWarning
        figureNumber={ctx.figureNumber}
        onConfirm={() => {
          setAsking(false);
          save();
        }}
        onCancel={() => setAsking(false)}
      />
    ) : null;
  return { request, warning };
}

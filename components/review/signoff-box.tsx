"use client";
// Placeholder: the review overview work fills this in (sign-off of a figure by its PI).
export interface SignoffBoxProps {
  figureId: string;
  figureHash: string;
  reviewState: string;
  canSignOff: boolean;
  signoffs: Array<{ id: string; userId: string; figureHash: string; reason: string; createdAt: string | Date; stale: boolean }>;
}
export function SignoffBox(_props: SignoffBoxProps) {
  return null;
}

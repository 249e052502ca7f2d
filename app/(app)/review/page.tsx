import { ReviewQueue } from "@/components/review/review-queue";
import { PageHeader } from "@/components/ui";

export const metadata = { title: "Waiting on me" };

export default function ReviewQueuePage() {
  return (
    <>
      <PageHeader
        title="Waiting on me"
        subtitle="Panels to review, threads that mention you, revisions asked of you and figures to sign off, across all your manuscripts."
      />
      <ReviewQueue />
    </>
  );
}

import { PageSkeleton } from "@/components/page-states";

export default function ManuscriptActivityLoading() {
  return <PageSkeleton what="the activity log" />;
}

import { PageSkeleton } from "@/components/page-states";

export default function ManuscriptBoardLoading() {
  return <PageSkeleton what="the review board" />;
}

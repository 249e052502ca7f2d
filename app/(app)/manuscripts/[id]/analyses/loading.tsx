import { PageSkeleton } from "@/components/page-states";

export default function ManuscriptAnalysesLoading() {
  return <PageSkeleton what="the analyses" />;
}

import { PageSkeleton } from "@/components/page-states";

export default function ManuscriptDataLoading() {
  return <PageSkeleton what="the data" />;
}

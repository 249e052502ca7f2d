import { PageSkeleton } from "@/components/page-states";

export default function ManuscriptLoading() {
  return <PageSkeleton what="the manuscript" layout="with-aside" />;
}

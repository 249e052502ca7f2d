import { PageSkeleton } from "@/components/page-states";

export default function ManuscriptMembersLoading() {
  return <PageSkeleton what="the members" />;
}

import { PageSkeleton } from "@/components/page-states";

export default function FigureStatusLoading() {
  return <PageSkeleton what="the figure status" />;
}

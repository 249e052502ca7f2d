import { PageSkeleton } from "@/components/page-states";

export default function FigureLoading() {
  return <PageSkeleton what="the figure" layout="with-aside" />;
}

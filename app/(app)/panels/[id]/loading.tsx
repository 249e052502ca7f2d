import { PageSkeleton } from "@/components/page-states";

export default function PanelLoading() {
  return <PageSkeleton what="the panel" layout="with-aside" />;
}

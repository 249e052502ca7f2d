import { SegmentNotFound } from "@/components/page-states";

/** notFound() of panels/[id] (its layout checks access above the loading state). */
export default function PanelNotFound() {
  return <SegmentNotFound what="panel">Open its figure from the manuscript to see the panels it has.</SegmentNotFound>;
}

import { SegmentNotFound } from "@/components/page-states";

/** notFound() of figures/[id] (its layout checks access above the loading state). */
export default function FigureNotFound() {
  return <SegmentNotFound what="figure">Check the link, or open the figure from its manuscript.</SegmentNotFound>;
}

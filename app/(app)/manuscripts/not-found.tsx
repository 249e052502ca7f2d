import { SegmentNotFound } from "@/components/page-states";

/** notFound() of manuscripts/[id] and its sub-pages (the [id] layout checks access above the loading state). */
export default function ManuscriptNotFound() {
  return <SegmentNotFound what="manuscript">To join one, ask its PI for an invitation.</SegmentNotFound>;
}

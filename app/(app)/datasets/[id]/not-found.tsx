import { SegmentNotFound } from "@/components/page-states";

export default function DatasetNotFound() {
  return <SegmentNotFound what="dataset">Datasets are listed on each manuscript&apos;s Data page.</SegmentNotFound>;
}

import { SegmentNotFound } from "@/components/page-states";

export default function VersionNotFound() {
  return <SegmentNotFound what="dataset version">Versions are listed on their dataset&apos;s page.</SegmentNotFound>;
}

import Link from "next/link";
import { EmptyState } from "@/components/ui/notice";

export default function PartNotFound() {
  return (
    <EmptyState title="No such part, or it is not shared with you">
      <Link href="/bench/parts" className="underline">Back to My parts</Link>
    </EmptyState>
  );
}

import Link from "next/link";
import { EmptyState } from "@/components/ui/notice";

export default function AssemblyNotFound() {
  return (
    <EmptyState title="No such assembly, or it is not shared with you">
      <Link href="/bench" className="underline">Back to the Bench</Link>
    </EmptyState>
  );
}

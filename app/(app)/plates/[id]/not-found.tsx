import { EmptyState } from "@/components/ui/notice";

export default function PlateNotFound() {
  return <EmptyState title="No such plate">A re-plan may have replaced it, or none of your parts are on it.</EmptyState>;
}

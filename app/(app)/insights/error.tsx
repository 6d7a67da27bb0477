"use client";
import { Button } from "@/components/ui/button";
import { Notice } from "@/components/ui/notice";

export default function InsightsError({ reset }: { error: Error; reset: () => void }) {
  return (
    <div className="space-y-4 py-8">
      <Notice tone="fail" title="The insights could not be worked out.">Try again; if it keeps failing, the database may be busy or unreachable.</Notice>
      <Button variant="secondary" onClick={reset}>
        Try again
      </Button>
    </div>
  );
}

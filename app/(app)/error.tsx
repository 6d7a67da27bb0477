"use client";

import { Button } from "@/components/ui/button";
import { Notice } from "@/components/ui/notice";

export default function AppError({ reset }: { error: Error; reset: () => void }) {
  return (
    <div className="flex max-w-xl flex-col gap-4 py-8">
      <Notice tone="fail" title="This page could not be shown.">
        Nothing you entered was lost. If the database was restarting, trying again usually works.
      </Notice>
      <div>
        <Button variant="secondary" onClick={reset}>
          Try again
        </Button>
      </div>
    </div>
  );
}

"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";

import { Button } from "@/components/ui/button";
import { Input } from "@/components/ui/field";

/** Opens the printable report of a chosen month. */
export function ReportPicker({ latestMonth }: { latestMonth: string }) {
  const router = useRouter();
  const [month, setMonth] = useState(latestMonth);
  const valid = /^\d{4}-(0[1-9]|1[0-2])$/.test(month);
  return (
    <form
      className="flex items-end gap-2"
      onSubmit={(e) => {
        e.preventDefault();
        if (valid) router.push(`/archive/report/${month}`);
      }}
    >
      <label className="flex flex-col gap-1 text-sm">
        <span className="font-medium text-ink-700">Monthly report</span>
        <Input
          type="month"
          value={month}
          onChange={(e) => setMonth(e.target.value)}
          aria-label="Month of the report"
          className="w-44"
        />
      </label>
      <Button type="submit" variant="secondary" disabled={!valid}>
        Open report
      </Button>
    </form>
  );
}

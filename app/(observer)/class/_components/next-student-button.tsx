"use client";

import { signOut } from "next-auth/react";
import { useEffect, useState } from "react";

import { Button } from "@/components/ui/button";

const SHARED_DEVICE_KEY = "heliotally.sharedClassDevice";

/**
 * On a shared class device (set up at /sign-in/class-device), hands over to
 * the next student: signs this one out and opens the quick sign-in again.
 * On a student's own device it shows nothing.
 */
export function NextStudentButton({ label = "Done, next student" }: { label?: string }) {
  const [code, setCode] = useState<string | null>(null);
  useEffect(() => {
    // localStorage exists only in the browser, after hydration.
    // eslint-disable-next-line react-hooks/set-state-in-effect
    setCode(window.localStorage.getItem(SHARED_DEVICE_KEY));
  }, []);
  if (!code) return null;
  return (
    <Button
      type="button"
      onClick={() => void signOut({ callbackUrl: `/sign-in/class-device?code=${encodeURIComponent(code)}` })}
      className="no-print"
    >
      {label}
    </Button>
  );
}

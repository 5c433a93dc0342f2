"use client";

import { signOut } from "next-auth/react";

export function SignOutButton() {
  return (
    <button
      type="button"
      onClick={() => signOut({ callbackUrl: "/" })}
      className="min-h-11 rounded-lg px-3 py-2 hover:bg-slate-100"
    >
      Sign out
    </button>
  );
}

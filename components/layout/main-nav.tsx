"use client";

import Link from "next/link";
import { usePathname } from "next/navigation";
import { useEffect, useId, useRef, useState, type ReactNode } from "react";

export type NavItem = {
  href: string;
  label: string;
  /** Used now and then: listed under "More" on wide screens, after the others on a phone. */
  more?: boolean;
};

/** The entry for the page shown: the longest href the path starts with, segment by segment. */
function findCurrentHref({ items, pathname }: { items: NavItem[]; pathname: string }): string | null {
  let best: string | null = null;
  for (const { href } of items) {
    const matches = pathname === href || pathname.startsWith(`${href}/`);
    if (matches && (!best || href.length > best.length)) best = href;
  }
  return best;
}

const linkClass = (current: boolean) =>
  `rounded-md px-3 py-1.5 text-sm whitespace-nowrap hover:bg-ink-800 hover:text-white ${
    current ? "bg-ink-800 text-white" : "text-ink-100"
  }`;

/**
 * The main navigation. Wide screens show the everyday entries in one line with
 * the occasional ones under "More"; a phone shows a single "Menu" button that
 * opens every entry and the account links in one column. Menus close on a
 * choice, on Escape, on a click elsewhere and when the page changes.
 */
export function MainNav({ items, account }: { items: NavItem[]; account: ReactNode }) {
  const pathname = usePathname();
  // Remembering the path a menu was opened on closes it once the page changes, without an effect.
  const [opened, setOpened] = useState<{ menu: "more" | "phone"; pathname: string } | null>(null);
  const open = opened && opened.pathname === pathname ? opened.menu : null;
  const close = () => setOpened(null);
  const toggle = (menu: "more" | "phone") =>
    setOpened((was) => (was?.menu === menu && was.pathname === pathname ? null : { menu, pathname }));

  const rootRef = useRef<HTMLDivElement>(null);
  const moreId = useId();
  const phoneId = useId();

  useEffect(() => {
    if (!open) return;
    const onKey = (event: KeyboardEvent) => {
      if (event.key === "Escape") setOpened(null);
    };
    const onPointer = (event: PointerEvent) => {
      if (!rootRef.current?.contains(event.target as Node)) setOpened(null);
    };
    document.addEventListener("keydown", onKey);
    document.addEventListener("pointerdown", onPointer);
    return () => {
      document.removeEventListener("keydown", onKey);
      document.removeEventListener("pointerdown", onPointer);
    };
  }, [open]);

  const currentHref = findCurrentHref({ items, pathname });
  const everyday = items.filter((item) => !item.more);
  const occasional = items.filter((item) => item.more);
  const moreHoldsCurrent = occasional.some((item) => item.href === currentHref);

  const renderLink = (item: NavItem, extra = "") => (
    <Link
      key={item.href}
      href={item.href}
      onClick={close}
      aria-current={item.href === currentHref ? "page" : undefined}
      className={`${linkClass(item.href === currentHref)} ${extra}`}
    >
      {item.label}
    </Link>
  );

  return (
    <div ref={rootRef} className="flex flex-1 items-center gap-4">
      <nav aria-label="Main" className="hidden flex-1 items-center gap-1 lg:flex">
        {everyday.map((item) => renderLink(item))}
        {occasional.length > 0 ? (
          <div className="relative">
            <button
              type="button"
              aria-expanded={open === "more"}
              aria-controls={moreId}
              onClick={() => toggle("more")}
              className={`${linkClass(moreHoldsCurrent)} flex items-center gap-1`}
            >
              More
              <span aria-hidden="true" className={`text-xs ${moreHoldsCurrent ? "text-corona-300" : ""}`}>
                ▾
              </span>
            </button>
            {open === "more" ? (
              <div
                id={moreId}
                className="absolute top-full left-0 z-30 mt-2 flex min-w-52 flex-col gap-1 rounded-lg border border-ink-800 bg-ink-950 p-2 shadow-lg"
              >
                {occasional.map((item) => renderLink(item, "block"))}
              </div>
            ) : null}
          </div>
        ) : null}
      </nav>
      <div className="hidden items-center gap-3 text-sm whitespace-nowrap lg:flex">{account}</div>

      <button
        type="button"
        aria-expanded={open === "phone"}
        aria-controls={phoneId}
        onClick={() => toggle("phone")}
        className="ml-auto rounded-md border border-ink-700 px-3 py-1.5 text-sm text-ink-100 hover:bg-ink-800 hover:text-white lg:hidden"
      >
        {open === "phone" ? "Close menu" : "Menu"}
      </button>
      {open === "phone" ? (
        <div
          id={phoneId}
          className="absolute inset-x-0 top-full z-30 border-t border-ink-800 bg-ink-950 px-4 pt-2 pb-4 shadow-lg lg:hidden"
        >
          <nav aria-label="Main" className="flex flex-col gap-1">
            {everyday.map((item) => renderLink(item, "block py-2"))}
            {occasional.length > 0 ? <hr className="my-1 border-ink-800" /> : null}
            {occasional.map((item) => renderLink(item, "block py-2"))}
          </nav>
          <div className="mt-3 flex flex-wrap items-center gap-3 border-t border-ink-800 pt-3 text-sm">
            {account}
          </div>
        </div>
      ) : null}
    </div>
  );
}

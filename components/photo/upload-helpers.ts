"use client";

import { generateReactHelpers } from "@uploadthing/react";

import type { PhotoRouter } from "@/app/api/uploadthing/core";

/** The SDK's React helpers, typed by our file router (they post to /api/uploadthing). */
export const { useUploadThing } = generateReactHelpers<PhotoRouter>();

import { createRouteHandler } from "uploadthing/next";

import { getUploadthingConfig } from "@/lib/photo-store/config";

import { photoRouter } from "./core";

/**
 * The SDK's own route handler: presigned uploads (POST ?actionType=upload),
 * the storage host's signed completion callback (POST with uploadthing-hook)
 * and the router's config (GET). Every setting comes from the environment.
 */
export const { GET, POST } = createRouteHandler({ router: photoRouter, config: getUploadthingConfig() });

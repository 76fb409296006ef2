import "server-only";

import { UTApi } from "uploadthing/server";

import { getUploadthingEnv } from "@/lib/env";

/**
 * The uploadthing SDK's configuration, from the environment only (lib/env.ts
 * fills the local storage host's defaults when the local token is in use).
 * The same object configures the route handler and UTApi, so both talk to
 * the same storage.
 */
export function getUploadthingConfig() {
  const env = getUploadthingEnv();
  return {
    token: env.token,
    callbackUrl: env.callbackUrl,
    ...(env.ingestUrl ? { ingestUrl: env.ingestUrl } : {}),
    ...(env.apiUrl ? { apiUrl: env.apiUrl } : {}),
    ...(env.ufsHost ? { ufsHost: env.ufsHost } : {}),
    ...(env.ufsAppIdLocation ? { ufsAppIdLocation: env.ufsAppIdLocation } : {}),
    logLevel: "Error" as const,
  };
}

let cached: { key: string; api: UTApi } | undefined;

/** UTApi for deleting files, uploading thumbnails and signing private URLs. */
export function getUtApi(): UTApi {
  const config = getUploadthingConfig();
  const key = JSON.stringify(config);
  if (cached?.key !== key) {
    const { callbackUrl: _unused, ...apiConfig } = config;
    void _unused;
    cached = { key, api: new UTApi(apiConfig) };
  }
  return cached.api;
}

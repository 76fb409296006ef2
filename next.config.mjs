/** @type {import('next').NextConfig} */
const nextConfig = {
  reactStrictMode: true,
  poweredByHeader: false,
  // `npm run typecheck` checks the whole project (tests included) as its own
  // step of `npm test`; checking again inside every build only costs time.
  typescript: { ignoreBuildErrors: true },
  // Packages with native or Node-only internals stay out of the server bundle.
  serverExternalPackages: ["@libsql/client", "libsql", "nodemailer", "smtp-server", "mailparser", "bcryptjs"],
  experimental: {
    // Enables forbidden() and app/forbidden.tsx for signed-in users without the role.
    authInterrupts: true,
    serverActions: { bodySizeLimit: "2mb" },
  },
};

export default nextConfig;
